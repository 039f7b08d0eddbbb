import { describe, expect, it } from 'vitest';
import { differenceWithin, exceedsCelsius, toTenths, withinTenths, withoutNoise } from '@/lib/arbitration/precision';

// How the module compares at 0.0001 °C: readings are snapped to integer tenths of m°C, limits are
// not rounded, and "within" allows only arithmetic noise (1e-10 °C) on top of the limit.

describe('resolution helpers', () => {
  it('snaps readings to whole tenths of m°C', () => {
    expect(-0.5005 * 10_000).not.toBe(-5005);
    expect(toTenths(-0.5005)).toBe(-5005);
    expect(toTenths(-0.52) - toTenths(-0.524)).toBe(40);
  });

  it('counts a measured value equal to the limit as within, and 0.1 m°C over as not', () => {
    expect(withinTenths(40, 40)).toBe(true);
    expect(withinTenths(40.00000000000036, 40)).toBe(true);
    expect(withinTenths(48, 0.0048 * 10_000)).toBe(true);
    expect(withinTenths(41, 40)).toBe(false);
    expect(differenceWithin(-0.52, -0.524, 0.004)).toBe(true);
    expect(differenceWithin(-0.52, -0.5241, 0.004)).toBe(false);
  });

  it('does not round a limit that falls between two steps', () => {
    // the critical range of four readings, 5.1428… m°C, and CD(2, 4) = 5.099 m°C, derived from the formula
    expect(withinTenths(51, 51.428571)).toBe(true);
    expect(withinTenths(52, 51.428571)).toBe(false);
    expect(differenceWithin(-0.5122, -0.5173, Math.sqrt(26) / 1000)).toBe(false);
  });

  it('treats "beyond" as strictly past, by more than noise', () => {
    expect(exceedsCelsius(-0.515, -0.515)).toBe(false);
    expect(exceedsCelsius(-0.5149, -0.515)).toBe(true);
    expect(exceedsCelsius(-0.515 + 1e-13, -0.515)).toBe(false);
  });

  it('strips noise from means without moving them', () => {
    expect((-0.5075 + -0.5082) / 2).not.toBe(-0.50785);
    expect(withoutNoise((-0.5075 + -0.5082) / 2)).toBe(-0.50785);
    expect(withoutNoise(-0.5143 - -0.5131)).toBe(-0.0012);
    expect(withoutNoise(-0.5226125)).toBe(-0.5226125);
  });
});
