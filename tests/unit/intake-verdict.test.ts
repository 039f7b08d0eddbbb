import { describe, expect, it } from 'vitest';
import { intakeVerdict } from '@/lib/intake/verdict';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import type { SchemeRules } from '@/lib/rules/schema';

// The scheme's verdict on one delivery, on both sides of each limit under each decision rule.
// Limits −0.515 °C (upper) and −0.560 °C (lower) are the example scheme's; precision r = 4, R = 6 m°C
// are ISO 5764:2009 Annex A rounded to the clause values (from memory). Values are invented loads.

const rulesWith = (decisionRule: SchemeRules['decisionRule']): SchemeRules => ({ ...defaultSchemeRules, decisionRule });
const VOLUME = 9_000; // litres
// 9 000 l × 0.46 EUR/l, the example scheme's milk price: the value of a rejected load, in cents.
const LOAD_VALUE_MINOR = 414_000;

/** One result (n = 1), so the guard band is 1.645·R/2.8 = 0.5875 R, ISO 4259's 0.59 R to within 0.02 m°C. */
const single = (value: number, rule: SchemeRules['decisionRule']) => intakeVerdict({ value, readingsUsed: 1, volumeLitres: VOLUME, rules: rulesWith(rule) });

describe('guarded rejection (benefit of the doubt to the supplier)', () => {
  it('accepts −0.512 °C and deducts −0.511 °C above the −0.515 °C limit: the ISO 4259 0.59 R example', () => {
    // ISO 4259, clause 9: with R = 6 m°C a single result is off-specification only beyond −0.51146 °C
    // (the product's threshold is −0.511475 °C, derived from the formula).
    const inside = single(-0.512, 'guarded_rejection');
    expect(inside).toMatchObject({ verdict: 'accepted', limitApplied: null, amountMinor: 0 });
    expect(inside.acceptanceLimit).toBeCloseTo(-0.511475, 9);
    const beyond = single(-0.511, 'guarded_rejection');
    expect(beyond).toMatchObject({ verdict: 'deducted', limitApplied: 'upper', limit: -0.515 });
  });

  it('prices the deduction as the added-water share of the volume at the milk price', () => {
    // Added water W = (T − T′)/T × 100 with T = 0.520 (common practice, textbook formula):
    // (0.520 − 0.511)/0.520 = 1.7308 %; 9 000 l × 1.7308 % × 0.46 EUR/l = 71.65 EUR (derived).
    const beyond = single(-0.511, 'guarded_rejection');
    expect(beyond.addedWaterPercent).toBeCloseTo(1.730769, 5);
    expect(beyond.amountMinor).toBe(7165);
    expect(beyond.arithmetic).toBe('9000 l × 1.73 % × 0.46 EUR/l');
  });

  it('moves the lower acceptance limit outward: −0.5635 °C accepted, −0.5636 °C rejected below −0.560 °C', () => {
    // JCGM 106:2012 and ILAC G8:09/2019, guarded rejection, w = 3.525 m°C for one result (derived from the formula)
    expect(single(-0.5635, 'guarded_rejection')).toMatchObject({ verdict: 'accepted', amountMinor: 0 });
    expect(single(-0.5636, 'guarded_rejection')).toMatchObject({ verdict: 'rejected', limitApplied: 'lower', limit: -0.56, addedWaterPercent: 0, amountMinor: LOAD_VALUE_MINOR });
  });

  it('narrows the guard band for a mean of two readings: u² = σR² − σr² + σr²/2', () => {
    // ISO 5725-6 variance of a mean of n results (derived): u = 1.8898 m°C, w = 3.1087 m°C,
    // acceptance limit −0.5118913 °C; −0.5119 °C is inside it, −0.5118 °C beyond.
    const two = (value: number) => intakeVerdict({ value, readingsUsed: 2, volumeLitres: VOLUME, rules: rulesWith('guarded_rejection') });
    expect(two(-0.5119)).toMatchObject({ verdict: 'accepted' });
    expect(two(-0.5119).acceptanceLimit).toBeCloseTo(-0.5118913, 6);
    expect(two(-0.5118)).toMatchObject({ verdict: 'deducted' });
  });
});

describe('simple acceptance (shared risk)', () => {
  it('accepts a result exactly at the upper limit and deducts one 0.1 m°C warmer', () => {
    // ILAC G8:09/2019, simple acceptance: the acceptance limit is the limit itself; beyond means strictly past it
    expect(single(-0.515, 'simple')).toMatchObject({ verdict: 'accepted', acceptanceLimit: -0.515 });
    const beyond = single(-0.5149, 'simple');
    expect(beyond).toMatchObject({ verdict: 'deducted', limitApplied: 'upper' });
    // (0.520 − 0.5149)/0.520 = 0.98077 %; 9 000 × 0.0098077 × 0.46 = 40.60 EUR (derived)
    expect(beyond.amountMinor).toBe(4060);
  });

  it('accepts a result exactly at the lower limit and rejects one 0.1 m°C colder', () => {
    // ILAC G8:09/2019, simple acceptance
    expect(single(-0.56, 'simple')).toMatchObject({ verdict: 'accepted' });
    expect(single(-0.5601, 'simple')).toMatchObject({ verdict: 'rejected', limitApplied: 'lower', amountMinor: LOAD_VALUE_MINOR });
  });
});

describe('guarded acceptance (benefit of the doubt to the buyer)', () => {
  it('moves the upper acceptance limit inward: −0.5186 °C accepted, −0.5185 °C deducted', () => {
    // JCGM 106:2012 and ILAC G8:09/2019, guarded acceptance, w = 3.525 m°C: acceptance limit −0.518525 °C (derived)
    const inside = single(-0.5186, 'guarded_acceptance');
    expect(inside).toMatchObject({ verdict: 'accepted' });
    expect(inside.acceptanceLimit).toBeCloseTo(-0.518525, 9);
    expect(single(-0.5185, 'guarded_acceptance')).toMatchObject({ verdict: 'deducted', limitApplied: 'upper' });
  });

  it('moves the lower acceptance limit inward: −0.5564 °C accepted, −0.5565 °C rejected', () => {
    // JCGM 106:2012, guarded acceptance: acceptance limit −0.556475 °C (derived)
    expect(single(-0.5564, 'guarded_acceptance')).toMatchObject({ verdict: 'accepted' });
    expect(single(-0.5565, 'guarded_acceptance')).toMatchObject({ verdict: 'rejected', limitApplied: 'lower' });
  });
});

describe('rejection share of added water', () => {
  it('deducts below 3 % added water and rejects from it, valuing the whole load', () => {
    // The example scheme rejects from 3 % added water: T′ = 0.520 × 0.97 = 0.5044 °C is the edge (derived).
    const below = single(-0.5045, 'guarded_rejection');
    expect(below.verdict).toBe('deducted');
    expect(below.addedWaterPercent).toBeCloseTo(2.980769, 5);
    const above = single(-0.5043, 'guarded_rejection');
    expect(above).toMatchObject({ verdict: 'rejected', limitApplied: 'upper', amountMinor: LOAD_VALUE_MINOR });
    expect(above.arithmetic).toBe('9000 l × 0.46 EUR/l');
  });

  it('rejects the textbook example T′ = 0.500 against T = 0.520: 3.846 % added water', () => {
    // Added water example (common practice, textbook formula): (0.520 − 0.500)/0.520 × 100 = 3.846 % (derived)
    const watered = single(-0.5, 'simple');
    expect(watered.addedWaterPercent).toBeCloseTo(3.846, 3);
    expect(watered.verdict).toBe('rejected');
  });

  it('reports no added water for an accepted load colder than the reference', () => {
    // W ≤ 0 means no added water is indicated (common practice)
    expect(single(-0.526, 'guarded_rejection')).toMatchObject({ verdict: 'accepted', addedWaterPercent: 0 });
  });
});

describe('a scheme without a lower limit', () => {
  it('never rejects a cold load for added solutes', () => {
    const rules: SchemeRules = { ...defaultSchemeRules, limits: { upper: -0.515 } };
    expect(intakeVerdict({ value: -0.6, readingsUsed: 2, volumeLitres: VOLUME, rules })).toMatchObject({ verdict: 'accepted', limitApplied: null });
  });
});
