import type { z } from 'zod';

/** Expected failures, each with the HTTP status an API answers with. Anything else is a bug and is thrown. */
const statusByCode = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  invalid: 400,
  unsupported_media_type: 415,
  payload_too_large: 413,
  rate_limited: 429,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof statusByCode;

const titleByCode: Record<ErrorCode, string> = {
  unauthenticated: 'Sign-in required',
  forbidden: 'Not allowed',
  not_found: 'Not found',
  conflict: 'Conflict with the current state',
  gone: 'No longer available',
  invalid: 'Invalid request',
  unsupported_media_type: 'Unsupported media type',
  payload_too_large: 'Request too large',
  rate_limited: 'Too many requests',
  unavailable: 'Temporarily unavailable',
};

/** Field path → messages, as forms and problem details both show them. */
export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fieldErrors?: FieldErrors;

  constructor(code: ErrorCode, message: string, options?: { fieldErrors?: FieldErrors }) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.fieldErrors = options?.fieldErrors;
  }

  get status(): number {
    return statusByCode[this.code];
  }

  get title(): string {
    return titleByCode[this.code];
  }
}

export function isAppError(error: unknown): error is AppError {
  return error instanceof AppError;
}

export function fieldErrorsFromZod(error: z.ZodError): FieldErrors {
  const fieldErrors: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join('.') : '_';
    (fieldErrors[key] ??= []).push(issue.message);
  }
  return fieldErrors;
}

export function invalidInput(error: z.ZodError, message = 'Some fields need attention.'): AppError {
  return new AppError('invalid', message, { fieldErrors: fieldErrorsFromZod(error) });
}

export function notFound(what = 'That record'): AppError {
  // Someone else's record answers exactly like a missing one.
  return new AppError('not_found', `${what} was not found.`);
}

/** RFC 9457 problem details. */
export type ProblemDetails = {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  code: ErrorCode;
  errors?: FieldErrors;
};

export function toProblemDetails(error: AppError, instance?: string): ProblemDetails {
  return {
    type: `https://countersample.test/problems/${error.code.replaceAll('_', '-')}`,
    title: error.title,
    status: error.status,
    detail: error.message,
    ...(instance ? { instance } : {}),
    code: error.code,
    ...(error.fieldErrors ? { errors: error.fieldErrors } : {}),
  };
}
