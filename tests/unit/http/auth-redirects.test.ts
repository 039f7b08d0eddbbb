import { describe, expect, it } from 'vitest';
import { isUsableRedirect } from '@/lib/http/auth-redirects';

describe('isUsableRedirect', () => {
  it('takes absolute URLs, paths on this site and the empty value', () => {
    for (const value of ['https://countersample.test/desk', '/desk', '/cases/1?tab=notes#x', '']) expect(isUsableRedirect(value), value).toBe(true);
  });

  it('refuses what cannot be parsed and paths that leave the site', () => {
    for (const value of [' ', 'desk', 'x y', '//evil.example', '/\\evil.example', 'http://']) expect(isUsableRedirect(value), value).toBe(false);
  });
});
