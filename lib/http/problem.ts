import { AppError, toProblemDetails } from '@/lib/errors';
import { jsonResponse } from './json-response';

export function problemResponse(error: AppError, instance?: string): Response {
  const headers = new Headers({ 'content-type': 'application/problem+json', 'cache-control': 'no-store' });
  if (error.code === 'unauthenticated') headers.set('www-authenticate', 'Cookie realm="countersample"');
  return jsonResponse(toProblemDetails(error, instance), { status: error.status, headers });
}

/** Expected errors become their problem details; anything else is logged and answered without detail. */
export function errorResponse(error: unknown, request: Request): Response {
  const instance = new URL(request.url).pathname;
  if (error instanceof AppError) return problemResponse(error, instance);
  console.error(`Unhandled error on ${request.method} ${instance}:`, error);
  const body = {
    type: 'https://countersample.test/problems/internal',
    title: 'Internal error',
    status: 500,
    detail: 'Something went wrong on our side; nothing was changed. Try again, and tell your administrator if it persists.',
    instance,
    code: 'internal',
  };
  return jsonResponse(body, { status: 500, headers: { 'content-type': 'application/problem+json', 'cache-control': 'no-store' } });
}
