import { describe, expect, it } from 'vitest';
import { calibrationCheck } from '@/lib/arbitration';

// The trade's routine check: five readings on a −0.512 °C standard, fit for work when at least 3 of
// the 5 lie within ±0.004 °C (common practice, no published source).
const rule = { nominal: -0.512, tolerance: 0.004, required: 3 };

describe('calibrationCheck', () => {
  it('passes with 3 of 5 within ±0.004 °C, two of them exactly at the tolerance', () => {
    // common practice, no published source; the boundary at exactly 0.004 °C counts as within
    expect(Math.abs(-0.516 - -0.512)).toBeGreaterThan(0.004); // the raw float deviation is over the tolerance
    const result = calibrationCheck({ ...rule, readings: [-0.516, -0.508, -0.5125, -0.5161, -0.5079] });
    expect(result).toEqual({ pass: true, within: 3, total: 5 });
  });

  it('fails with 2 of 5 within, the others 0.1 m°C over the tolerance', () => {
    // common practice, no published source
    const result = calibrationCheck({ ...rule, readings: [-0.5161, -0.5079, -0.5118, -0.5161, -0.5122] });
    expect(result).toEqual({ pass: false, within: 2, total: 5 });
  });

  it('passes with all five on the standard', () => {
    // common practice, no published source
    expect(calibrationCheck({ ...rule, readings: [-0.512, -0.5121, -0.5119, -0.5122, -0.5118] })).toEqual({
      pass: true,
      within: 5,
      total: 5,
    });
  });

  it('follows the scheme when it asks for a different k of n', () => {
    // common practice, no published source: the product keeps the rule as a configurable k of n
    const readings = [-0.5125, -0.513, -0.5109, -0.5168];
    expect(calibrationCheck({ ...rule, readings, required: 3 }).pass).toBe(true);
    expect(calibrationCheck({ ...rule, readings, required: 4 }).pass).toBe(false);
    expect(calibrationCheck({ ...rule, readings, tolerance: 0.001, required: 2 })).toEqual({
      pass: true,
      within: 2,
      total: 4,
    });
  });

  it('holds the boundary for a tolerance that is not exact in floating point (0.0029 °C)', () => {
    // common practice, no published source: within means |reading − nominal| ≤ tolerance
    expect(0.0029 * 10_000).toBeLessThan(29);
    const readings = [-0.5149, -0.5091, -0.515];
    expect(calibrationCheck({ ...rule, readings, tolerance: 0.0029, required: 2 })).toEqual({
      pass: true,
      within: 2,
      total: 3,
    });
  });

  it('fails with no readings at all', () => {
    expect(calibrationCheck({ ...rule, readings: [] })).toEqual({ pass: false, within: 0, total: 0 });
  });

  it('refuses a rule that cannot be applied', () => {
    expect(() => calibrationCheck({ ...rule, readings: [-0.512], required: 0 })).toThrow(RangeError);
    expect(() => calibrationCheck({ ...rule, readings: [-0.512], tolerance: -0.004 })).toThrow(RangeError);
    expect(() => calibrationCheck({ ...rule, readings: [Number.NaN] })).toThrow(RangeError);
  });
});
