import { AppError } from '@/lib/errors';

function holdsNul(value: unknown, depth = 0): boolean {
  if (typeof value === 'string') return value.includes('\u0000');
  if (depth > 64 || !value || typeof value !== 'object') return false;
  return Object.entries(value).some(([key, inner]) => key.includes('\u0000') || holdsNul(inner, depth + 1));
}

function decoded(text: string): string {
  try {
    return decodeURIComponent(text);
  } catch {
    return text;
  }
}

/**
 * PostgreSQL text cannot hold a NUL character: a query that compares with one fails, and a library
 * that passes it on (better-auth's token lookups) answers 500. No real input contains one, so a
 * request that carries one in its path, query or body is refused as a 400 before anything runs.
 */
export async function nulTextRefusal(request: Request): Promise<AppError | null> {
  const url = new URL(request.url);
  let found = decoded(url.pathname).includes('\u0000') || [...url.searchParams].some(([k, v]) => k.includes('\u0000') || v.includes('\u0000'));
  if (!found && request.body) {
    const text = await request.clone().text();
    if (/json/i.test(request.headers.get('content-type') ?? '')) {
      try {
        found = holdsNul(JSON.parse(text));
      } catch {
        found = text.includes('\u0000');
      }
    } else found = decoded(text).includes('\u0000');
  }
  return found ? new AppError('invalid', 'Text in a request may not contain NUL characters.') : null;
}
