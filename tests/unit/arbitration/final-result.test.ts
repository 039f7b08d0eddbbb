import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { criticalRangeOfFour, finalResult, medianOfFour } from '@/lib/arbitration';

// ISO 5764:2009 bovine milk precision, rounded clause values (from memory)
const iso5764 = { r: 0.004, R: 0.006 };

// How resolution applies here: readings are snapped to 0.0001 °C, so a difference or a range of
// readings is an exact number of tenths of m°C; the limit it is compared with (r, or the critical
// range f(4)·r/2.8) is not rounded. A value equal to the limit is within it.

describe('finalResult: two readings', () => {
  it('takes the mean when the first two differ by exactly r, despite floating point', () => {
    // ISO 5725-6:1994, 5.2.2: |x1 − x2| ≤ r → mean of the two
    expect(Math.abs(-0.52 - -0.524)).toBeGreaterThan(0.004); // the raw float difference is over r
    expect(finalResult([-0.52, -0.524], iso5764)).toEqual({
      status: 'accepted',
      value: -0.522,
      basis: 'mean_of_2',
      used: 2,
    });
  });

  it('does not let floating point move r itself: r = 4.8 m°C is 47.99999999999999 tenths as a double', () => {
    // ISO 5725-6:1994, 5.2.2; a scheme may set r = 0.0048 °C
    const r48 = { r: 0.0048, R: 0.0068 };
    expect(0.0048 * 10_000).toBeLessThan(48);
    expect(finalResult([-0.52, -0.5248], r48)).toMatchObject({ status: 'accepted', basis: 'mean_of_2' });
    expect(finalResult([-0.52, -0.5249], r48)).toEqual({ status: 'needs_more_readings', needed: 2 });
  });

  it('asks for two more when the first two differ by 0.1 m°C more than r', () => {
    // ISO 5725-6:1994, 5.2.2: |x1 − x2| > r → two more results
    expect(finalResult([-0.52, -0.5241], iso5764)).toEqual({ status: 'needs_more_readings', needed: 2 });
  });

  it('asks for one more with three readings whose first two disagree', () => {
    // ISO 5725-6:1994, 5.2.2
    expect(finalResult([-0.5205, -0.5255, -0.5231], iso5764)).toEqual({ status: 'needs_more_readings', needed: 1 });
  });

  it('asks for readings when there are none or one', () => {
    // ISO 5725-6:1994, 5.2.2: the procedure starts from two results
    expect(finalResult([], iso5764)).toEqual({ status: 'needs_more_readings', needed: 2 });
    expect(finalResult([-0.5213], iso5764)).toEqual({ status: 'needs_more_readings', needed: 1 });
  });

  it('ignores readings past the two it used', () => {
    // ISO 5725-6:1994, 5.2.2: the first two agree, so the procedure ends there
    expect(finalResult([-0.5212, -0.5228, -0.5301], iso5764)).toEqual({
      status: 'accepted',
      value: -0.522,
      basis: 'mean_of_2',
      used: 2,
    });
  });
});

describe('finalResult: four readings', () => {
  it('uses the critical range f(4)·σr = 3.6 × r / 2.8 = 5.1428… m°C, unrounded', () => {
    // ISO 5725-6:1994, 5.2.2 and Table 1; value derived from the formula
    expect(criticalRangeOfFour(iso5764)).toBeCloseTo(0.0051428571, 10);
  });

  it('takes the mean of four when the range, 5.1 m°C, is within the critical range', () => {
    // ISO 5725-6:1994, 5.2.2: range ≤ CR0.95(4) → mean of the four
    const result = finalResult([-0.52, -0.5245, -0.5251, -0.521], iso5764);
    expect(result).toEqual({ status: 'accepted', value: -0.52265, basis: 'mean_of_4', used: 4 });
  });

  it('takes the median of four when the range, 5.2 m°C, is just over the critical range', () => {
    // ISO 5725-6:1994, 5.2.2: range > CR0.95(4) → median of the four
    const result = finalResult([-0.52, -0.5245, -0.5252, -0.521], iso5764);
    expect(result).toEqual({ status: 'accepted', value: -0.52275, basis: 'median_of_4', used: 4 });
  });

  it('does not round the critical range to the resolution: 5.3 m°C is over 5.271 m°C', () => {
    // ISO 5725-6:1994, 5.2.2; with the unrounded ISO 5764:2009 Annex A value r = 4.1 m°C (from memory)
    // the critical range is 3.6 × 4.1 / 2.8 = 5.271 m°C (derived from the formula). Rounded to the
    // resolution it would be 5.3 m°C and 5.3 would pass; it must not.
    const r41 = { r: 0.0041, R: 0.0061 };
    expect(finalResult([-0.52, -0.5242, -0.5252, -0.521], r41)).toMatchObject({ basis: 'mean_of_4' }); // 5.2 m°C
    expect(finalResult([-0.52, -0.5242, -0.5253, -0.521], r41)).toMatchObject({ basis: 'median_of_4' }); // 5.3 m°C
  });

  it('ignores readings past the four it used', () => {
    // ISO 5725-6:1994, 5.2.2
    const five = finalResult([-0.52, -0.5245, -0.5251, -0.521, -0.5599], iso5764);
    expect(five).toEqual(finalResult([-0.52, -0.5245, -0.5251, -0.521], iso5764));
  });

  it('refuses a reading that is not a number', () => {
    expect(() => finalResult([-0.52, Number.NaN], iso5764)).toThrow(RangeError);
  });
});

/** All 24 orders of four values. */
function permutationsOf(values: readonly number[]): number[][] {
  if (values.length <= 1) return [[...values]];
  const all: number[][] = [];
  for (let i = 0; i < values.length; i++) {
    const rest = [...values.slice(0, i), ...values.slice(i + 1)];
    for (const tail of permutationsOf(rest)) all.push([values[i], ...tail]);
  }
  return all;
}

describe('median of four (property)', () => {
  it('has 24 distinct orders to draw from', () => {
    expect(new Set(permutationsOf([1, 2, 3, 4]).map((p) => p.join(','))).size).toBe(24);
  });

  const tenths = fc.integer({ min: -6000, max: -4000 });

  it('does not depend on the order of the readings', () => {
    // ISO 5725-6:1994, 5.2.2: the median of four is the mean of the two middle values
    fc.assert(
      fc.property(fc.tuple(tenths, tenths, tenths, tenths), fc.nat(23), (values, k) => {
        const [a, b, c, d] = permutationsOf(values)[k];
        const sorted = [...values].sort((x, y) => x - y);
        expect(medianOfFour(a, b, c, d)).toBe((sorted[1] + sorted[2]) / 2);
      }),
    );
  });

  it('gives the same final result for any order of four readings that are all more than r apart', () => {
    // ISO 5725-6:1994, 5.2.2: every pair disagrees, so any order leads to the median of four
    fc.assert(
      fc.property(
        tenths,
        fc.tuple(
          fc.integer({ min: 41, max: 120 }),
          fc.integer({ min: 41, max: 120 }),
          fc.integer({ min: 41, max: 120 }),
        ),
        fc.nat(23),
        (start, gaps, k) => {
          const ordered = [start, start - gaps[0], start - gaps[0] - gaps[1], start - gaps[0] - gaps[1] - gaps[2]].map(
            (t) => t / 10_000,
          );
          const result = finalResult(permutationsOf(ordered)[k], iso5764);
          expect(result).toEqual(finalResult(ordered, iso5764));
          expect(result).toMatchObject({ status: 'accepted', basis: 'median_of_4', used: 4 });
        },
      ),
    );
  });
});
