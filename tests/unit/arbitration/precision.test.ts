import fc from 'fast-check';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { criticalDifference, criticalRangeFactor } from '@/lib/arbitration';

const iso5764 = { r: 0.004, R: 0.006 };

describe('criticalRangeFactor', () => {
  it('gives the critical range factors f(n) for n = 2 … 10', () => {
    // ISO 5725-6:1994, Table 1 (from memory; recomputed below)
    const table: [number, number][] = [
      [2, 2.8],
      [3, 3.3],
      [4, 3.6],
      [5, 3.9],
      [6, 4.0],
      [7, 4.2],
      [8, 4.3],
      [9, 4.4],
      [10, 4.5],
    ];
    for (const [n, f] of table) expect(criticalRangeFactor(n)).toBe(f);
  });

  it('matches the 95 % quantile of the range of n normal values from jstat, to one decimal', () => {
    // ISO 5725-6:1994, Table 1, cross-checked: the studentized range with (nearly) infinite degrees
    // of freedom is the range of n standard normal values.
    for (let n = 2; n <= 10; n++) {
      const quantile = jStat.tukey.inv(0.95, n, 1e6);
      expect(Math.round(quantile * 10) / 10).toBe(criticalRangeFactor(n));
    }
  });

  it('reproduces the recomputed quantiles 2.772, 3.314, 3.633, 3.858, 4.030 … 4.474', () => {
    // derived from the formula: the 95 % quantile of the range of n standard normal values
    const recomputed: [number, number][] = [
      [2, 2.772],
      [3, 3.314],
      [4, 3.633],
      [5, 3.858],
      [6, 4.03],
      [10, 4.474],
    ];
    for (const [n, q] of recomputed) expect(jStat.tukey.inv(0.95, n, 1e6)).toBeCloseTo(q, 2);
  });

  it('f(2) is 1.96 × √2, the factor between r and σr', () => {
    // ISO 5725-6:1994, r = 2.8 σr (derived from the formula)
    expect(1.96 * Math.SQRT2).toBeCloseTo(criticalRangeFactor(2), 1);
  });

  it('refuses n outside the table', () => {
    for (const n of [0, 1, 11, 2.5, Number.NaN]) expect(() => criticalRangeFactor(n)).toThrow(RangeError);
  });
});

describe('criticalDifference', () => {
  it('gives the critical differences for r = 4 m°C, R = 6 m°C', () => {
    // ISO 5764:2009 precision r = 0.004, R = 0.006 °C; ISO 5725-6:1994 formula; values derived from the formula
    expect(criticalDifference(iso5764, 1, 1) * 1000).toBeCloseTo(6.0, 3);
    expect(criticalDifference(iso5764, 1, 2) * 1000).toBeCloseTo(Math.sqrt(32), 3); // 5.657, derived from the formula
    expect(criticalDifference(iso5764, 1, 2) * 1000).toBeCloseTo(5.657, 3);
    expect(criticalDifference(iso5764, 2, 2) * 1000).toBeCloseTo(5.292, 3);
    expect(criticalDifference(iso5764, 2, 4) * 1000).toBeCloseTo(5.099, 3);
    expect(criticalDifference(iso5764, 4, 4) * 1000).toBeCloseTo(4.899, 3);
  });

  it('is symmetric in the two laboratories', () => {
    // derived from the formula
    expect(criticalDifference(iso5764, 2, 4)).toBe(criticalDifference(iso5764, 4, 2));
  });

  it('refuses impossible precision and counts', () => {
    expect(() => criticalDifference({ r: 0, R: 0.006 }, 2, 2)).toThrow(RangeError);
    expect(() => criticalDifference({ r: 0.006, R: 0.004 }, 2, 2)).toThrow(RangeError);
    expect(() => criticalDifference(iso5764, 0, 2)).toThrow(RangeError);
    expect(() => criticalDifference(iso5764, 2, 1.5)).toThrow(RangeError);
  });

  it('decreases as either laboratory averages more readings (property)', () => {
    // derived from the formula: 1/(2n) falls as n grows, so the term subtracted from R² grows
    fc.assert(
      fc.property(
        fc.integer({ min: 10, max: 200 }),
        fc.integer({ min: 0, max: 200 }),
        fc.integer({ min: 1, max: 100 }),
        fc.integer({ min: 1, max: 100 }),
        (rTenths, extraTenths, n1, n2) => {
          const precision = { r: rTenths / 10_000, R: (rTenths + extraTenths) / 10_000 };
          const here = criticalDifference(precision, n1, n2);
          expect(criticalDifference(precision, n1 + 1, n2)).toBeLessThan(here);
          expect(criticalDifference(precision, n1, n2 + 1)).toBeLessThan(here);
        },
      ),
    );
  });
});
