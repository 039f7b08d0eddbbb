import 'server-only';
import type { z } from 'zod';
import { actorFromHeaders } from '@/lib/auth/session';
import type { Actor } from '@/lib/auth/actor';
import { AppError, invalidInput } from '@/lib/errors';
import { jsonResponse } from './json-response';
import { errorResponse } from './problem';

type RouteContext<P> = { params: Promise<P> };
type Handler<P, A> = (input: { request: Request; actor: A; params: P }) => Promise<Response | object>;

function toResponse(result: Response | object): Response {
  return result instanceof Response ? result : jsonResponse(result, { headers: { 'cache-control': 'no-store' } });
}

/**
 * The one wrapper for JSON routes: session → handler → JSON, with every expected error as RFC 9457
 * problem details. Handlers parse their own input with the helpers below, against their schema.
 */
export function withActor<P = Record<string, never>>(handler: Handler<P, Actor>) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const actor = await actorFromHeaders(request.headers);
      if (!actor) throw new AppError('unauthenticated', 'Sign in to use this API.');
      return toResponse(await handler({ request, actor, params: await context.params }));
    } catch (error) {
      return errorResponse(error, request);
    }
  };
}

export function withoutActor<P = Record<string, never>>(handler: Handler<P, null>) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      return toResponse(await handler({ request, actor: null, params: await context.params }));
    } catch (error) {
      return errorResponse(error, request);
    }
  };
}

const MAX_JSON_BYTES = 256 * 1024;

/** Reads a JSON body; a wrong type, an oversized body or bad JSON is a 4xx, never a 500. */
export async function readJsonBody(request: Request): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^application\/(.+\+)?json\b/i.test(type)) {
    throw new AppError('unsupported_media_type', 'Send the body as JSON with Content-Type: application/json.');
  }
  const text = await request.text();
  if (Buffer.byteLength(text) > MAX_JSON_BYTES) throw new AppError('payload_too_large', 'The body is larger than 256 KiB.');
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError('invalid', 'The body is not valid JSON.');
  }
}

/** Reads and validates a JSON body against its schema. */
export async function parseJsonBody<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
  const parsed = schema.safeParse(await readJsonBody(request));
  if (!parsed.success) throw invalidInput(parsed.error, 'The body does not match the expected schema.');
  return parsed.data;
}

export function parseSearchParams<S extends z.ZodType>(request: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw invalidInput(parsed.error, 'The query string has invalid parameters.');
  return parsed.data;
}

export function parseParams<S extends z.ZodType>(params: unknown, schema: S, what = 'That record'): z.infer<S> {
  const parsed = schema.safeParse(params);
  // A malformed id cannot name anything the caller may see: same answer as a missing one.
  if (!parsed.success) throw new AppError('not_found', `${what} was not found.`);
  return parsed.data;
}
