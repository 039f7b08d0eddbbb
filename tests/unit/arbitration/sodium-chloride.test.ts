import { describe, expect, it } from 'vitest';
import { sodiumChlorideFor } from '@/lib/arbitration';

describe('sodiumChlorideFor', () => {
  it('gives the table value for each standard', () => {
    // ISO 5764:2009, Table 1 (g NaCl per kg of water → freezing point)
    const table: [number, number][] = [
      [-0.4, 6.763],
      [-0.408, 6.901],
      [-0.45, 7.625],
      [-0.5, 8.489],
      [-0.51, 8.662],
      [-0.512, 8.697],
      [-0.52, 8.835],
      [-0.53, 9.008],
      [-0.54, 9.181],
      [-0.55, 9.354],
      [-0.557, 9.475],
      [-0.6, 10.22],
    ];
    for (const [freezingPoint, grams] of table) expect(sodiumChlorideFor(freezingPoint)).toBe(grams);
  });

  it('interpolates linearly between rows', () => {
    // ISO 5764:2009, Table 1; values between rows derived from the formula (linear interpolation)
    expect(sodiumChlorideFor(-0.505)).toBeCloseTo((8.489 + 8.662) / 2, 12);
    expect(sodiumChlorideFor(-0.511)).toBeCloseTo((8.662 + 8.697) / 2, 12);
    expect(sodiumChlorideFor(-0.429)).toBeCloseTo((6.901 + 7.625) / 2, 12);
    expect(sodiumChlorideFor(-0.58)).toBeCloseTo(9.475 + (0.023 / 0.043) * (10.22 - 9.475), 12);
  });

  it('takes a row value even when the input carries floating-point noise', () => {
    // ISO 5764:2009, Table 1
    expect(sodiumChlorideFor(-0.5 - 0.012)).toBe(8.697);
  });

  it('refuses freezing points outside −0.400 … −0.600 °C', () => {
    // ISO 5764:2009, Table 1 covers −0.400 to −0.600 °C only
    expect(() => sodiumChlorideFor(-0.3999)).toThrow(RangeError);
    expect(() => sodiumChlorideFor(-0.6001)).toThrow(RangeError);
    expect(() => sodiumChlorideFor(0)).toThrow(RangeError);
    expect(() => sodiumChlorideFor(Number.NaN)).toThrow(RangeError);
  });
});
