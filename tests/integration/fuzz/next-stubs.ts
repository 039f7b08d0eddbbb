/**
 * Stand-ins for the Next.js request APIs a server action touches outside a request: the headers are
 * the fuzzer's, and a revalidation or redirect is recorded (on bad input there must be none).
 */
export const requestState = { headers: new Headers(), revalidated: [] as string[], navigations: [] as string[] };

function cookieStore(headers: Headers) {
  const jar = new Map<string, string>();
  for (const part of (headers.get('cookie') ?? '').split(';')) {
    const at = part.indexOf('=');
    if (at > 0) jar.set(part.slice(0, at).trim(), part.slice(at + 1).trim());
  }
  return {
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    getAll: () => [...jar].map(([name, value]) => ({ name, value })),
    has: (name: string) => jar.has(name),
    set: (name: string, value: string) => void jar.set(name, value),
    delete: (name: string) => void jar.delete(name),
  };
}

export const nextHeaders = {
  headers: async () => requestState.headers,
  cookies: async () => cookieStore(requestState.headers),
  draftMode: async () => ({ isEnabled: false, enable() {}, disable() {} }),
};

export const nextCache = {
  revalidatePath: (path: string) => void requestState.revalidated.push(path),
  revalidateTag: (tag: string) => void requestState.revalidated.push(`tag:${tag}`),
  updateTag: (tag: string) => void requestState.revalidated.push(`tag:${tag}`),
  refresh: () => void requestState.revalidated.push('refresh'),
  unstable_cache: <T>(fn: T) => fn,
};

function navigation(kind: string, digest: string) {
  return (url?: string) => {
    requestState.navigations.push(`${kind} ${url ?? ''}`);
    // Same digest shape as Next's, so the form wrapper lets it through as it would in production.
    throw Object.assign(new Error(digest), { digest: `${digest};${url ?? ''}` });
  };
}

export const nextNavigation = {
  redirect: navigation('redirect', 'NEXT_REDIRECT'),
  permanentRedirect: navigation('permanentRedirect', 'NEXT_REDIRECT'),
  notFound: navigation('notFound', 'NEXT_HTTP_ERROR_FALLBACK;404'),
  forbidden: navigation('forbidden', 'NEXT_HTTP_ERROR_FALLBACK;403'),
  unauthorized: navigation('unauthorized', 'NEXT_HTTP_ERROR_FALLBACK;401'),
};
