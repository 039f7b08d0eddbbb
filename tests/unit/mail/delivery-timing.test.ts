import { describe, expect, it } from 'vitest';
import { deliveryWait, LONGEST_WAIT_MS, QUIET_MS } from '@/lib/mail/delivery-timing';

describe('when queued notices are handed over', () => {
  const woken = 1_000_000;

  it('waits for a pause after a lone commit, then delivers', () => {
    expect(deliveryWait(woken, woken, woken)).toBe(QUIET_MS);
    expect(deliveryWait(woken + QUIET_MS - 1, woken, woken)).toBe(1);
    expect(deliveryWait(woken + QUIET_MS, woken, woken)).toBe(0);
  });

  it('keeps waiting while commits follow each other closely', () => {
    const lastCommit = woken + 1_500;
    expect(deliveryWait(woken + 1_600, woken, lastCommit)).toBe(QUIET_MS - 100);
  });

  it('never waits past the longest wait after it was woken, however busy the server', () => {
    const almost = woken + LONGEST_WAIT_MS - 50;
    expect(deliveryWait(almost, woken, almost)).toBe(50);
    expect(deliveryWait(woken + LONGEST_WAIT_MS, woken, woken + LONGEST_WAIT_MS)).toBe(0);
    expect(deliveryWait(woken + LONGEST_WAIT_MS + 5_000, woken, woken + LONGEST_WAIT_MS + 4_990)).toBe(0);
  });
});
