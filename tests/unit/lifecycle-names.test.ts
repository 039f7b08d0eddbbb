import { describe, expect, it } from 'vitest';
import { isTransitionName } from '@/lib/cases/lifecycle';

describe('isTransitionName', () => {
  it('knows the transitions by name', () => {
    expect(isTransitionName('dispatch')).toBe(true);
    expect(isTransitionName('toString')).toBe(false);
  });

  // A server action's arguments come from the client as any serialisable value.
  it('answers false, without throwing, for values that are not strings', () => {
    for (const value of [{ toString: 0 }, { toString: 'dispatch' }, null, undefined, 1, ['dispatch']]) expect(isTransitionName(value)).toBe(false);
  });
});
