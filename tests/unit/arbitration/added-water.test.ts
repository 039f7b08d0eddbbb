import { describe, expect, it } from 'vitest';
import { addedWater } from '@/lib/arbitration';

describe('addedWater', () => {
  it('gives 3.846 % for T = 0.520 and T′ = 0.500, as depressions or as freezing points', () => {
    // common practice, no published source (textbook formula W = (T − T′)/T × 100); value derived from the formula
    const asDepressions = addedWater({ reference: 0.52, sample: 0.5 });
    expect(asDepressions.percent).toBeCloseTo(3.846, 3);
    expect(asDepressions.indicated).toBe(true);
    const asFreezingPoints = addedWater({ reference: -0.52, sample: -0.5 });
    expect(asFreezingPoints.percent).toBeCloseTo(asDepressions.percent, 12);
    expect(asFreezingPoints.indicated).toBe(true);
  });

  it('gives 3.365 % with 12.5 % total solids', () => {
    // from memory: W = (T − T′)(100 − TS)/T, food-analysis textbooks; value derived from the formula
    expect(addedWater({ reference: -0.52, sample: -0.5, totalSolids: 12.5 }).percent).toBeCloseTo(3.365, 3);
  });

  it('gives 2.78 % for a −0.540 °H base and a sample at the −0.525 °H legal base', () => {
    // J. Food Prot. 42(2):110, 1979 (Henningson): "about 3 %" tolerance a −0.525 °H base allows
    const result = addedWater({ reference: -0.54, sample: -0.525 });
    expect(result.percent).toBeCloseTo(2.78, 2);
    expect(result.indicated).toBe(true);
  });

  it('indicates no added water when the sample freezes lower than the reference', () => {
    // common practice, no published source: W ≤ 0 means no added water is indicated
    const result = addedWater({ reference: -0.52, sample: -0.53 });
    expect(result.percent).toBeCloseTo(-1.923, 3); // derived from the formula
    expect(result.indicated).toBe(false);
  });

  it('gives exactly 0 % and no indication for a sample equal to the reference', () => {
    // common practice, no published source
    expect(addedWater({ reference: -0.52, sample: -0.52 })).toEqual({ percent: 0, indicated: false });
    expect(addedWater({ reference: -0.5213, sample: (-0.5211 + -0.5215) / 2 })).toEqual({
      percent: 0,
      indicated: false,
    });
  });

  it('refuses a zero reference and impossible total solids', () => {
    expect(() => addedWater({ reference: 0, sample: -0.5 })).toThrow(RangeError);
    expect(() => addedWater({ reference: -0.52, sample: -0.5, totalSolids: 100 })).toThrow(RangeError);
    expect(() => addedWater({ reference: -0.52, sample: -0.5, totalSolids: -1 })).toThrow(RangeError);
  });
});
