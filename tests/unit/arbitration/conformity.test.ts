import fc from 'fast-check';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { conformity, normalCdf, standardUncertainty, type DecisionRule } from '@/lib/arbitration';

// ISO 5764:2009 bovine milk precision, rounded clause values (from memory)
const iso5764 = { r: 0.004, R: 0.006 };
const single = { n: [1], precision: iso5764 };

describe('the ISO 4259 "0.59 R" example', () => {
  // Limit −0.515 °C, R = 6 m°C, one result; the product's guard band 1.645·R/2.8 = 0.5875 R.
  const rejection = (value: number) =>
    conformity({ ...single, value, limit: -0.515, side: 'upper', rule: 'guarded_rejection' });

  it("puts the rejection threshold at −0.511475 °C, within 0.00002 °C of ISO 4259's −0.51146 °C", () => {
    // ISO 4259, clause 9: threshold = limit + 0.59 R = −0.51146 °C (derived from the formula)
    const { acceptanceLimit, guardBand } = rejection(-0.512);
    expect(acceptanceLimit).toBeCloseTo(-0.511475, 9); // derived from the formula
    expect(guardBand).toBeCloseTo(0.5875 * 0.006, 12); // derived from the formula
    expect(Math.abs(acceptanceLimit - (-0.515 + 0.59 * 0.006))).toBeLessThan(0.00002); // ISO 4259, clause 9
  });

  it('cannot reject −0.512 °C but can reject −0.511 °C', () => {
    // ISO 4259, clause 9 (example derived from the formula)
    expect(rejection(-0.512).beyond).toBe(false);
    expect(rejection(-0.511).beyond).toBe(true);
  });

  it('still counts −0.5115 °C, 0.025 m°C short of the threshold, as within', () => {
    // derived from the formula: −0.5115 < −0.511475
    expect(rejection(-0.5115).beyond).toBe(false);
    expect(rejection(-0.5114).beyond).toBe(true);
  });

  it('under simple acceptance rejects −0.512 °C, which is above the limit itself', () => {
    // ILAC G8:09/2019, simple acceptance: the acceptance limit is the tolerance limit
    const simple = conformity({ ...single, value: -0.512, limit: -0.515, side: 'upper', rule: 'simple' });
    expect(simple).toMatchObject({ beyond: true, acceptanceLimit: -0.515, guardBand: 0 });
  });

  it('counts a value exactly at the limit as within under simple acceptance', () => {
    // ILAC G8:09/2019, simple acceptance: beyond means strictly past the limit
    expect(conformity({ ...single, value: -0.515, limit: -0.515, side: 'upper', rule: 'simple' }).beyond).toBe(false);
    expect(conformity({ ...single, value: -0.5149, limit: -0.515, side: 'upper', rule: 'simple' }).beyond).toBe(true);
  });
});

describe('probability beyond the limit', () => {
  it('gives 0.825 for y = −0.513 against T_U = −0.515 with u = 2.143 m°C', () => {
    // JCGM 106:2012, Φ((y − T_U)/u); example derived from the formula
    const result = conformity({ ...single, value: -0.513, limit: -0.515, side: 'upper', rule: 'simple' });
    expect(standardUncertainty(iso5764, [1]) * 1000).toBeCloseTo(2.143, 3); // u = R/2.8, derived from the formula
    expect(result.probabilityBeyond).toBeCloseTo(0.825, 3);
  });

  it('is one half at the limit, on either side', () => {
    // JCGM 106:2012 (derived from the formula)
    expect(
      conformity({ ...single, value: -0.515, limit: -0.515, side: 'upper', rule: 'simple' }).probabilityBeyond,
    ).toBe(0.5);
    expect(conformity({ ...single, value: -0.56, limit: -0.56, side: 'lower', rule: 'simple' }).probabilityBeyond).toBe(
      0.5,
    );
  });

  it('mirrors for the lower limit: Φ((T_L − y)/u)', () => {
    // JCGM 106:2012 (derived from the formula)
    const result = conformity({ ...single, value: -0.562, limit: -0.56, side: 'lower', rule: 'simple' });
    expect(result.probabilityBeyond).toBeCloseTo(jStat.normal.cdf(0.002 / (0.006 / 2.8), 0, 1), 12);
  });
});

describe('guard bands', () => {
  it('moves the lower acceptance limit outward under guarded rejection and inward under guarded acceptance', () => {
    // JCGM 106:2012 and ILAC G8:09/2019; values derived from the formula (w = 3.525 m°C)
    const rejection = conformity({ ...single, value: -0.563, limit: -0.56, side: 'lower', rule: 'guarded_rejection' });
    expect(rejection.acceptanceLimit).toBeCloseTo(-0.563525, 9);
    expect(rejection.beyond).toBe(false);
    expect(
      conformity({ ...single, value: -0.5636, limit: -0.56, side: 'lower', rule: 'guarded_rejection' }).beyond,
    ).toBe(true);

    const acceptance = conformity({
      ...single,
      value: -0.5565,
      limit: -0.56,
      side: 'lower',
      rule: 'guarded_acceptance',
    });
    expect(acceptance.acceptanceLimit).toBeCloseTo(-0.556475, 9);
    expect(acceptance.beyond).toBe(true);
  });

  it('moves the upper acceptance limit inward under guarded acceptance', () => {
    // JCGM 106:2012 and ILAC G8:09/2019; derived from the formula: −0.515 − 0.003525 = −0.518525
    const at = (value: number) =>
      conformity({ ...single, value, limit: -0.515, side: 'upper', rule: 'guarded_acceptance' }).beyond;
    expect(at(-0.5185)).toBe(true);
    expect(at(-0.5186)).toBe(false);
  });

  it('narrows for the mean of two laboratories: u² = Σ(σR² − σr² + σr²/n_i)/k²', () => {
    // the product's guard band, derived from the formula: n = [2, 2] → u = 1.336 m°C, w = 2.198 m°C
    const u = standardUncertainty(iso5764, [2, 2]);
    const sR = 0.006 / 2.8;
    const sr = 0.004 / 2.8;
    expect(u).toBeCloseTo(Math.sqrt(2 * (sR * sR - sr * sr + (sr * sr) / 2)) / 2, 15);
    expect(u * 1000).toBeCloseTo(1.336, 3);
    const result = conformity({
      value: -0.513,
      n: [2, 2],
      precision: iso5764,
      limit: -0.515,
      side: 'upper',
      rule: 'guarded_rejection',
    });
    expect(result.guardBand * 1000).toBeCloseTo(2.198, 3);
  });

  it('refuses an empty list of laboratories or a count that is not whole', () => {
    expect(() => standardUncertainty(iso5764, [])).toThrow(RangeError);
    expect(() => standardUncertainty(iso5764, [2, 0])).toThrow(RangeError);
  });
});

describe('normalCdf', () => {
  it('agrees with jstat to 1e-14 from −8 to 8', () => {
    // Hart's algorithm 5666 against jstat's normal distribution (general-purpose library cross-check)
    let worst = 0;
    for (let x = -8; x <= 8; x += 0.01) worst = Math.max(worst, Math.abs(normalCdf(x) - jStat.normal.cdf(x, 0, 1)));
    expect(worst).toBeLessThan(1e-14);
  });

  it('gives the textbook values Φ(1.645) = 0.95 and Φ(1.96) = 0.975', () => {
    // from memory: standard normal table values
    expect(normalCdf(1.645)).toBeCloseTo(0.95, 4);
    expect(normalCdf(1.96)).toBeCloseTo(0.975, 4);
    expect(normalCdf(-40)).toBe(0);
    expect(normalCdf(40)).toBe(1);
  });
});

describe('conformity properties', () => {
  const rules: DecisionRule[] = ['simple', 'guarded_rejection', 'guarded_acceptance'];
  const rule = fc.constantFrom(...rules);
  const side = fc.constantFrom('upper' as const, 'lower' as const);
  const counts = fc.constantFrom([1], [2], [4], [2, 2], [2, 4], [4, 4]);
  const tenths = fc.integer({ min: -6500, max: -4500 });
  const precision = fc
    .tuple(fc.integer({ min: 10, max: 80 }), fc.integer({ min: 0, max: 60 }))
    .map(([r, extra]) => ({ r: r / 10_000, R: (r + extra) / 10_000 }));

  it('never turns "beyond" off when a value moves further beyond the limit', () => {
    // JCGM 106:2012: the acceptance limit does not depend on the value (derived from the formula)
    fc.assert(
      fc.property(
        tenths,
        tenths,
        fc.integer({ min: 0, max: 1000 }),
        rule,
        side,
        counts,
        precision,
        (v, l, step, r, s, n, p) => {
          const base = { n, precision: p, limit: l / 10_000, side: s, rule: r };
          const before = conformity({ ...base, value: v / 10_000 });
          const further = (s === 'upper' ? v + step : v - step) / 10_000;
          const after = conformity({ ...base, value: further });
          if (before.beyond) expect(after.beyond).toBe(true);
          expect(after.probabilityBeyond).toBeGreaterThanOrEqual(before.probabilityBeyond);
        },
      ),
    );
  });

  it('guarded rejection never rejects what simple acceptance accepts', () => {
    // JCGM 106:2012 and ILAC G8:09/2019, guarded rejection widens the acceptance zone
    fc.assert(
      fc.property(tenths, tenths, side, counts, precision, (v, l, s, n, p) => {
        const base = { value: v / 10_000, n, precision: p, limit: l / 10_000, side: s };
        const simple = conformity({ ...base, rule: 'simple' });
        const guarded = conformity({ ...base, rule: 'guarded_rejection' });
        if (!simple.beyond) expect(guarded.beyond).toBe(false);
      }),
    );
  });

  it('guarded acceptance never accepts what simple acceptance rejects', () => {
    // JCGM 106:2012 and ILAC G8:09/2019, guarded acceptance narrows the acceptance zone
    fc.assert(
      fc.property(tenths, tenths, side, counts, precision, (v, l, s, n, p) => {
        const base = { value: v / 10_000, n, precision: p, limit: l / 10_000, side: s };
        const simple = conformity({ ...base, rule: 'simple' });
        const guarded = conformity({ ...base, rule: 'guarded_acceptance' });
        if (simple.beyond) expect(guarded.beyond).toBe(true);
      }),
    );
  });

  it('the guarded rules do differ from simple acceptance somewhere in the draws', () => {
    // Guards the two properties above against being vacuous: some value is within under guarded
    // rejection yet beyond under simple acceptance, and the reverse for guarded acceptance.
    const base = { n: [1], precision: iso5764, limit: -0.515, side: 'upper' as const };
    expect(conformity({ ...base, value: -0.513, rule: 'simple' }).beyond).toBe(true);
    expect(conformity({ ...base, value: -0.513, rule: 'guarded_rejection' }).beyond).toBe(false);
    expect(conformity({ ...base, value: -0.517, rule: 'simple' }).beyond).toBe(false);
    expect(conformity({ ...base, value: -0.517, rule: 'guarded_acceptance' }).beyond).toBe(true);
  });
});
