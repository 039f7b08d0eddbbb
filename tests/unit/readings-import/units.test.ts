import { describe, expect, it } from 'vitest';
import { hortvetToCelsius } from '@/lib/arbitration';
import { parseUnit, toStoredResolution } from '@/lib/readings-import';
import { toTenthMilliC } from '@/lib/temperature';
import { importText, intakeTarget } from './fixtures';

describe('units', () => {
  it('reads the ways a unit is written', () => {
    expect(['m°C', 'mC', 'M°C', 'mdegC'].map(parseUnit)).toEqual(['mC', 'mC', 'mC', 'mC']);
    expect(['°C', 'C', 'degC', 'ºC'].map(parseUnit)).toEqual(['C', 'C', 'C', 'C']);
    expect(['°H', 'H', 'Hortvet'].map(parseUnit)).toEqual(['H', 'H', 'H']);
    expect(parseUnit('K')).toBeNull();
  });

  it('gives m°C and °C values the stored value lib/temperature gives the same °C', () => {
    // 1 m°C = 0.001 °C by definition of the prefix; stored in tenths of m°C as lib/temperature does.
    expect(toStoredResolution(-512.3, 'mC', null)).toEqual({ ok: true, tenthMilliC: toTenthMilliC(-0.5123), rounded: false });
    expect(toStoredResolution(-0.5123, 'C', null)).toEqual({ ok: true, tenthMilliC: toTenthMilliC(-0.5123), rounded: false });
    expect(toStoredResolution(-512.35, 'mC', null).ok).toBe(false);
  });

  it('converts °H with the scheme’s conversion, rounded to 0.0001 °C', () => {
    // AOAC 961.07 sucrose standard: −0.621 °H = −0.600 °C (the sucrose line passes through it).
    expect(toStoredResolution(-0.621, 'H', 'sucrose_line')).toEqual({ ok: true, tenthMilliC: -6000, rounded: true });
    // °C = 0.9658 × °H, from memory (seen in trade use), as the existing conversion tests say.
    expect(toStoredResolution(-0.525, 'H', 'factor')).toEqual({ ok: true, tenthMilliC: toTenthMilliC(hortvetToCelsius(-0.525, 'factor')), rounded: true });
    expect(toTenthMilliC(hortvetToCelsius(-0.525, 'factor'))).toBe(-5070); // −0.507045 °C, derived from the formula
    expect(toStoredResolution(-0.525, 'H', null).ok).toBe(false);
  });

  it('mixes units row by row when the file has a unit column', () => {
    const { result } = importText('replicate,freezing_point,unit\n1,-512.4,m°C\n2,-0.5130,°C\n3,-0.531,°H\n4,-0.5126,°C', intakeTarget);
    expect(result.errors).toEqual([]);
    // −0.531 °H on the sucrose line: 0.96482 × −0.531 − 0.00084 = −0.51316 °C, derived from the formula.
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.5124', '-0.5130', '-0.5132', '-0.5126']);
    expect(result.meta.convertedFromHortvet).toBe(true);
  });
});
