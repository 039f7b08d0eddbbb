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
  { path: () => '/outbox', expected: { admin: 200, plant: 404, lab: 404, arbiter: 404, supplier: 404, supplier2: 404, anonymous: 'sign-in' } },
  { path: () => '/about/method', expected: { admin: 200, plant: 200, lab: 200, arbiter: 200, supplier: 200, supplier2: 200, anonymous: 200 } },
];

// Matched as rendered markup: the text also sits in every page's RSC payload as a string.
const NOT_FOUND_HEADING = /<h1[^>]*>There is nothing here you can open<\/h1>/;
const ERROR_HEADING = /<h1[^>]*>(<span[^>]*>)?.{0,4}This page could not be shown/;

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
  // A 200 must be the page itself, not a not-found or error page with the wrong status.
  if (response.status === 200 && NOT_FOUND_HEADING.test(html)) return '200 with the not-found page';
  if (response.status === 404 && !NOT_FOUND_HEADING.test(html)) return '404 without the not-found page';
  if (response.status === 200 && ERROR_HEADING.test(html)) return '200 with the error page';
  return String(response.status);
}

describe('every page, every visitor', () => {
  for (const page of pages) {
    it(`GET ${page.path().replace(/[0-9a-f-]{36}/, '<case of supplier@>')}`, async () => {
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
