import { describe, expect, it } from 'vitest';
import { fixtures } from '../support/fixtures';

type Who = 'admin' | 'plant' | 'lab' | 'arbiter' | 'supplier' | 'supplier2' | 'anonymous';
type Expected = 200 | 404 | 'sign-in';

const who: Who[] = ['admin', 'plant', 'lab', 'arbiter', 'supplier', 'supplier2', 'anonymous'];
const caseId = () => fixtures().caseOfSupplier.id;

/**
 * Every page and what each visitor gets: the page, the not-found page (a role without the
 * permission, or someone else's record), or a redirect to sign in (no session).
 */
const pages: { path: () => string; expected: Record<Who, Expected> }[] = [
  { path: () => '/desk', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => '/cases', expected: { admin: 404, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => `/cases/${caseId()}`, expected: { admin: 404, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/deliveries', expected: { admin: 404, plant: 200, lab: 404, arbiter: 404, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => '/admin/organisations', expected: { admin: 200, plant: 404, lab: 404, arbiter: 404, supplier: 404, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/admin/users', expected: { admin: 200, plant: 404, lab: 404, arbiter: 404, supplier: 404, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/admin/rules', expected: { admin: 200, plant: 404, lab: 404, arbiter: 404, supplier: 404, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/rules', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => '/account', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => `/deliveries/${fixtures().deliveryOfSupplier.id}/dispute`, expected: { admin: 404, plant: 404, lab: 404, arbiter: 404, supplier: 200, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/method/proposal', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 'sign-in' } },
  { path: () => '/outbox', expected: { admin: 200, plant: 404, lab: 404, arbiter: 404, supplier: 404, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/about/method', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 200 } },
];

// A page that calls notFound() or throws while streaming still answers 200; the flight data then
// carries the digest. An honest 404 may render the not-found page on the client only, so for those
// the status and the digest are what count, not the markup.
const DIGEST = /:E\{\\"digest\\":\\"([^\\"]+)\\"/;
const NOT_FOUND_HEADING = /<h1[^>]*>There is nothing here you can open<\/h1>/;

async function visit(path: string, visitor: Who): Promise<string> {
  const { baseUrl, cookies } = fixtures();
  const headers: Record<string, string> = {};
  if (visitor !== 'anonymous') headers.cookie = cookies[visitor];
  const response = await fetch(new URL(path, baseUrl), { headers, redirect: 'manual' });
  if ([301, 302, 303, 307, 308].includes(response.status)) {
    const location = new URL(response.headers.get('location') ?? '', baseUrl);
    return location.pathname === '/sign-in' ? 'sign-in' : `redirect to ${location.pathname}`;
  }
  const html = await response.text();
  const digest = html.match(DIGEST)?.[1] ?? null;
  const notFoundShown = digest === 'NEXT_HTTP_ERROR_FALLBACK;404' || NOT_FOUND_HEADING.test(html);
  if (response.status === 200 && notFoundShown) return '200 with the not-found page';
  if (response.status === 200 && digest) return `200 with an error (${digest})`;
  if (response.status === 404 && !notFoundShown) return '404 without the not-found page';
  return String(response.status);
}

describe('every page, every visitor', () => {
  for (const page of pages) {
    it(`GET ${page.path().replace(/\/cases\/[0-9a-f-]{36}/, '/cases/<case of supplier@>').replace(/\/deliveries\/[0-9a-f-]{36}/, '/deliveries/<delivery of supplier@>')}`, async () => {
      const actual: Record<string, string> = {};
      for (const visitor of who) actual[visitor] = await visit(page.path(), visitor);
      const expected = Object.fromEntries(who.map((w) => [w, String(page.expected[w])]));
      expect(actual).toEqual(expected);
    });
  }

  it('sends an anonymous visitor to sign in with the page to come back to', async () => {
    const response = await fetch(new URL('/cases', fixtures().baseUrl), { redirect: 'manual' });
    const location = new URL(response.headers.get('location') ?? '', fixtures().baseUrl);
    expect(location.pathname).toBe('/sign-in');
    expect(location.searchParams.get('next')).toBe('/cases');
  });
});
