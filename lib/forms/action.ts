import 'server-only';
import type { z } from 'zod';
import { getActor } from '@/lib/auth/session';
import type { Actor } from '@/lib/auth/actor';
import { AppError, fieldErrorsFromZod, type FieldErrors } from '@/lib/errors';

/** What every server action returns to its form: a message, and field errors to show beside the fields. */
export type FormState = { ok: boolean; message: string; fieldErrors?: FieldErrors; values?: Record<string, string> } | null;

function echoValues(formData: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData.entries()) {
    // Secrets are never sent back to the browser, not even to refill a form.
    if (typeof value === 'string' && !/password|token|confirm/i.test(key)) values[key] = value;
  }
  return values;
}

function isNavigationSignal(error: unknown): boolean {
  // redirect() and notFound() work by throwing; they must pass through.
  return !!error && typeof error === 'object' && 'digest' in error && String((error as { digest: unknown }).digest).startsWith('NEXT_');
}

/** Runs a handler and turns expected errors into form state; navigation signals pass through. */
async function guarded(handler: () => Promise<FormState | void>, values?: Record<string, string>): Promise<FormState> {
  try {
    return (await handler()) ?? { ok: true, message: 'Saved.' };
  } catch (error) {
    if (isNavigationSignal(error)) throw error;
    if (error instanceof AppError) return { ok: false, message: error.message, fieldErrors: error.fieldErrors, values };
    console.error('Unhandled error in a form action:', error);
    return { ok: false, message: 'Something went wrong on our side; nothing was changed.', values };
  }
}

async function run<S extends z.ZodType>(schema: S, formData: FormData, handler: (input: z.infer<S>) => Promise<FormState | void>): Promise<FormState> {
  const values = echoValues(formData);
  return guarded(async () => {
    const parsed = schema.safeParse(Object.fromEntries(formData));
    if (!parsed.success) return { ok: false, message: 'Some fields need attention.', fieldErrors: fieldErrorsFromZod(parsed.error), values };
    return handler(parsed.data);
  }, values);
}

/**
 * The one wrapper for form actions: session → zod parse → handler → FormState. Expected errors come
 * back as values for the form; anything else is logged and reported without detail.
 */
export function formAction<S extends z.ZodType>(schema: S, handler: (input: z.infer<S>, actor: Actor) => Promise<FormState | void>) {
  return async (_previous: FormState, formData: FormData): Promise<FormState> => {
    const actor = await getActor();
    if (!actor) return { ok: false, message: 'Your session has ended. Sign in again; nothing was changed.' };
    return run(schema, formData, (input) => handler(input, actor));
  };
}

/** The same, for the few forms used before there is a session (accepting an invitation). */
export function anonymousFormAction<S extends z.ZodType>(schema: S, handler: (input: z.infer<S>) => Promise<FormState | void>) {
  return async (_previous: FormState, formData: FormData): Promise<FormState> => run(schema, formData, handler);
}

/**
 * For actions that client forms call with structured values (arrays of readings, dates) rather than
 * FormData; the handler validates them itself with the same schema the form used.
 */
export async function actorAction(handler: (actor: Actor) => Promise<FormState | void>): Promise<FormState> {
  const actor = await getActor();
  if (!actor) return { ok: false, message: 'Your session has ended. Sign in again; nothing was changed.' };
  return guarded(() => handler(actor));
}
