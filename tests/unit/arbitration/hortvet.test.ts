import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { celsiusToHortvet, HORTVET_FACTOR, hortvetToCelsius, SUCROSE_LINE } from '@/lib/arbitration';

describe('degrees Hortvet, factor conversion', () => {
  it('converts with °C = 0.9658 × °H', () => {
    // from memory; seen in trade use
    expect(HORTVET_FACTOR).toBe(0.9658);
    expect(hortvetToCelsius(-0.525, 'factor')).toBeCloseTo(-0.507045, 9); // derived from the formula
    expect(hortvetToCelsius(-0.54, 'factor')).toBeCloseTo(-0.521532, 9); // derived from the formula
  });

  it('inverts exactly', () => {
    // derived from the formula
    expect(celsiusToHortvet(-0.507045, 'factor')).toBeCloseTo(-0.525, 12);
  });
});

describe('degrees Hortvet, sucrose line', () => {
  it('passes through the AOAC 961.07 sucrose standards', () => {
    // AOAC 961.07: −0.422 °H = −0.408 °C and −0.621 °H = −0.600 °C
    expect(hortvetToCelsius(-0.422, 'sucrose_line')).toBeCloseTo(-0.408, 12);
    expect(hortvetToCelsius(-0.621, 'sucrose_line')).toBeCloseTo(-0.6, 12);
    expect(celsiusToHortvet(-0.408, 'sucrose_line')).toBeCloseTo(-0.422, 12);
    expect(celsiusToHortvet(-0.6, 'sucrose_line')).toBeCloseTo(-0.621, 12);
  });

  it('is °C = 0.96482 × °H − 0.00084', () => {
    // derived from the formula through the AOAC 961.07 points
    expect(SUCROSE_LINE.slope).toBeCloseTo(0.96482, 5);
    expect(SUCROSE_LINE.intercept).toBeCloseTo(-0.00084, 5);
    expect(hortvetToCelsius(-0.525, 'sucrose_line')).toBeCloseTo(-0.507377, 6);
  });

  it('differs from the factor conversion by a fraction of a m°C over the milk range', () => {
    // derived from the formula: 0.33 m°C at −0.525 °H, at most 0.43 m°C between the sucrose standards
    const gap = (h: number) => Math.abs(hortvetToCelsius(h, 'sucrose_line') - hortvetToCelsius(h, 'factor'));
    expect(gap(-0.525) * 1000).toBeCloseTo(0.332, 3);
    for (let h = -0.621; h <= -0.422; h += 0.001) expect(gap(h)).toBeLessThan(0.00045);
  });
});

describe('both conversions (property)', () => {
  it('invert each other to within 1e-12 °H', () => {
    // derived from the formula
    fc.assert(
      fc.property(
        fc.integer({ min: -7000, max: -3000 }),
        fc.constantFrom('factor' as const, 'sucrose_line' as const),
        (t, c) => {
          const h = t / 10_000;
          expect(Math.abs(celsiusToHortvet(hortvetToCelsius(h, c), c) - h)).toBeLessThan(1e-12);
        },
      ),
    );
  });

  it('refuse a value that is not a number', () => {
    expect(() => hortvetToCelsius(Number.NaN, 'factor')).toThrow(RangeError);
    expect(() => celsiusToHortvet(Number.POSITIVE_INFINITY, 'sucrose_line')).toThrow(RangeError);
  });
});
