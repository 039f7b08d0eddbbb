import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const { LETTER_CHECKS_PER_WINDOW, LETTER_CHECK_WINDOW_MS, letterCheckAllowed } = await import('@/lib/throttle/letter-checks');

const from = (address: string) => new Headers({ 'x-forwarded-for': `${address}, 10.0.0.1` });

describe('checks of decision letters from one address', () => {
  beforeAll(() => {
    process.env.COUNTERSAMPLE_RATE_LIMIT = 'on';
  });
  afterAll(() => {
    delete process.env.COUNTERSAMPLE_RATE_LIMIT;
  });

  it('allows the limit, refuses the next, and counts each address on its own', async () => {
    const now = Date.UTC(2026, 11, 2, 9, 0);
    const answers: boolean[] = [];
    for (let i = 0; i < LETTER_CHECKS_PER_WINDOW + 1; i++) answers.push(await letterCheckAllowed(from('192.0.2.7'), now + i));
    expect(answers.slice(0, LETTER_CHECKS_PER_WINDOW).every(Boolean)).toBe(true);
    expect(answers[LETTER_CHECKS_PER_WINDOW]).toBe(false);
    expect(await letterCheckAllowed(from('198.51.100.4'), now)).toBe(true);
  });

  it('starts a new window once the old one has passed', async () => {
    const now = Date.UTC(2026, 11, 2, 10, 0);
    for (let i = 0; i <= LETTER_CHECKS_PER_WINDOW; i++) await letterCheckAllowed(from('203.0.113.9'), now);
    expect(await letterCheckAllowed(from('203.0.113.9'), now)).toBe(false);
    expect(await letterCheckAllowed(from('203.0.113.9'), now + LETTER_CHECK_WINDOW_MS + 1)).toBe(true);
  });

  it('is off in the test suite unless a test asks for it', async () => {
    delete process.env.COUNTERSAMPLE_RATE_LIMIT;
    for (let i = 0; i <= LETTER_CHECKS_PER_WINDOW + 5; i++) expect(await letterCheckAllowed(from('192.0.2.99'))).toBe(true);
    process.env.COUNTERSAMPLE_RATE_LIMIT = 'on';
  });
});
