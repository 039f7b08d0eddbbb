// HTTP plumbing of the upload service: bounded bodies, JSON answers and problem details.
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { z } from 'zod';
import { AppError, fieldErrorsFromZod, toProblemDetails } from '../errors';

export const MAX_JSON_BODY_BYTES = 1024 * 1024;

/** The client went away mid-body: nobody is left to answer, and it may try again with the same URL. */
export class ClientAborted extends AppError {
  constructor() {
    super('invalid', 'The upload was interrupted.');
  }
}

/** Reads a request body into memory, refusing it (413) as soon as it passes `limitBytes`. */
export function readBody(req: IncomingMessage, limitBytes: number): Promise<Buffer> {
  const declared = Number(req.headers['content-length']);
  if (Number.isFinite(declared) && declared > limitBytes) {
    return Promise.reject(new AppError('payload_too_large', `The request body is larger than the ${limitBytes} bytes allowed here.`));
  }
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let received = 0;
    let settled = false;
    const fail = (error: Error) => {
      if (settled) return;
      settled = true;
      req.removeListener('data', onData);
      // Keep reading and dropping, so the client can still read the answer.
      req.resume();
      reject(error);
    };
    const onData = (chunk: Buffer) => {
      received += chunk.length;
      if (received > limitBytes) fail(new AppError('payload_too_large', `The request body is larger than the ${limitBytes} bytes allowed here.`));
      else chunks.push(chunk);
    };
    req.on('data', onData);
    req.once('end', () => {
      if (settled) return;
      settled = true;
      resolve(Buffer.concat(chunks));
    });
    req.once('aborted', () => fail(new ClientAborted()));
    req.once('error', () => fail(new ClientAborted()));
  });
}

export async function readJson<S extends z.ZodType>(req: IncomingMessage, schema: S): Promise<z.infer<S>> {
  const body = await readBody(req, MAX_JSON_BODY_BYTES);
  let json: unknown;
  try {
    json = JSON.parse(body.toString('utf8'));
  } catch {
    throw new AppError('invalid', 'The request body is not valid JSON.');
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) throw new AppError('invalid', 'The request body does not have the expected shape.', { fieldErrors: fieldErrorsFromZod(parsed.error) });
  return parsed.data;
}

export function sendJson(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  if (res.headersSent) return void res.end();
  const text = JSON.stringify(body);
  res.writeHead(status, { ...headers, 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}

export function sendProblem(res: ServerResponse, error: AppError, instance?: string, headers: Record<string, string> = {}): void {
  if (res.headersSent) return void res.end();
  const text = JSON.stringify(toProblemDetails(error, instance));
  res.writeHead(error.status, { ...headers, 'content-type': 'application/problem+json; charset=utf-8', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}
