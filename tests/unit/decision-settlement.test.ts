import { describe, expect, it } from 'vitest';
import { amountForLoad, settlementFor, SettlementError, toBasisPoints, type SettlementInput } from '@/lib/decision/settlement';

// Every figure below is worked out by hand in its comment ("hand-worked example"), from the formula
// the scheme rules name: a deduction is volume × added-water share × price, rounded half up to the
// currency's minor unit once, at the end. Prices and fees are those of the demo scheme unless said.

const base: SettlementInput = {
  outcome: 'uphold',
  currency: 'EUR',
  volumeLitres: 9_000,
  pricePerLitre: 0.46,
  intake: { verdict: 'rejected', amountMinor: 414_000, addedWaterBasisPoints: 316 },
  acceptedAddedWaterPercent: 3.12,
  refereeFee: 180,
  feeBorneBy: 'losing_party',
};

describe('amountForLoad', () => {
  it('values a whole load: hand-worked example 9,000 l × 0.46 EUR/l = 4,140.00 EUR', () => {
    expect(amountForLoad(9_000, 0.46, 'EUR')).toBe(414_000);
  });

  it('deducts the added-water share: hand-worked example 12,500 l × 2.40 % × 0.46 EUR/l = 138.00 EUR', () => {
    // 12,500 × 0.024 = 300 l of water; 300 × 0.46 = 138.00.
    expect(amountForLoad(12_500, 0.46, 'EUR', 240)).toBe(13_800);
  });

  it('rounds half up once, at the end: hand-worked example 7,333 l × 1.23 % × 0.4625 EUR/l = 41.72 EUR', () => {
    // 7,333 × 123 = 901,959; × 4,625 = 4,171,560,375, in units of 10⁻⁸ EUR: 41.71560375 EUR → 41.72.
    expect(amountForLoad(7_333, 0.4625, 'EUR', 123)).toBe(4_172);
  });

  it('rounds an exact half cent up, where a binary float would not: hand-worked example 1 l × 0.005 EUR/l = 0.01 EUR', () => {
    // 0.005 is stored as 0.005000000000000000104…, but 1.005 × 100 is 100.49999… in binary: the exact
    // integer path gives 0.5 cent → 1 cent, and 201 l × 0.005 = 1.005 EUR → 1.01 EUR.
    expect(amountForLoad(1, 0.005, 'EUR')).toBe(1);
    expect(amountForLoad(201, 0.005, 'EUR')).toBe(101);
    expect(Math.round(1.005 * 100)).toBe(100);
  });

  it('uses the currency’s own minor unit: hand-worked example 9,000 l × 1.50 % × 62 JPY/l = 8,370 JPY', () => {
    // 9,000 × 0.015 = 135 l; 135 × 62 = 8,370 yen, and the yen has no minor unit.
    expect(amountForLoad(9_000, 62, 'JPY', 150)).toBe(8_370);
  });

  it('refuses fractional litres or basis points instead of guessing', () => {
    expect(() => amountForLoad(10.5, 0.46, 'EUR')).toThrow(SettlementError);
    expect(() => amountForLoad(10, 0.46, 'EUR', 1.5)).toThrow(SettlementError);
    expect(() => amountForLoad(10, -0.46, 'EUR')).toThrow(SettlementError);
  });
});

describe('toBasisPoints', () => {
  it('keeps added water in hundredths of a percent, and none when not indicated', () => {
    expect(toBasisPoints(3.1249)).toBe(312);
    expect(toBasisPoints(3.125)).toBe(313);
    expect(toBasisPoints(0)).toBe(0);
    expect(toBasisPoints(-1.4)).toBe(0);
  });
});

describe('settlementFor', () => {
  it('uphold: the withheld amount stays withheld and the supplier, who lost, bears the fee', () => {
    // Hand-worked example: rejected load 9,000 l × 0.46 EUR/l = €4,140.00 withheld; nothing changes hands; fee €180.00.
    const s = settlementFor(base);
    expect(s.withheldAtIntake).toEqual({ amountMinor: 414_000, arithmetic: '9,000 l × 0.46 EUR/l = €4,140.00' });
    expect(s.correctedDeduction).toBeNull();
    expect(s.balance).toMatchObject({ amountMinor: 0, payer: null, payee: null });
    expect(s.refereeFee).toMatchObject({ amountMinor: 18_000, borneBy: 'supplier', rule: 'losing_party' });
    expect(s.lines).toEqual([
      'Withheld at intake: 9,000 l × 0.46 EUR/l = €4,140.00.',
      'The intake result stands: the €4,140.00 withheld at intake stays withheld.',
      "Referee laboratory's fee: €180.00, borne by the supplier (scheme rule: the losing party bears the fee; here the supplier).",
    ]);
  });

  it('reverse: the plant pays back what it withheld, and bears the fee', () => {
    // Hand-worked example: a deducted load, 12,500 l × 2.40 % × 0.46 EUR/l = €138.00, is paid back in full.
    const s = settlementFor({ ...base, outcome: 'reverse', volumeLitres: 12_500, intake: { verdict: 'deducted', amountMinor: 13_800, addedWaterBasisPoints: 240 } });
    expect(s.withheldAtIntake.arithmetic).toBe('12,500 l × 2.40 % × 0.46 EUR/l = €138.00');
    expect(s.balance).toEqual({ amountMinor: 13_800, payer: 'plant', payee: 'supplier', arithmetic: 'The intake result is reversed: the plant pays the supplier the €138.00 withheld at intake.' });
    expect(s.refereeFee.borneBy).toBe('plant');
  });

  it('adjust down: the plant owes the difference to the corrected deduction, and bears the fee', () => {
    // Hand-worked example: withheld 12,500 l × 2.40 % × 0.46 = €138.00; accepted 1.10 %:
    // 12,500 × 0.011 = 137.5 l × 0.46 = €63.25; owed €138.00 − €63.25 = €74.75 to the supplier.
    const s = settlementFor({ ...base, outcome: 'adjust', volumeLitres: 12_500, intake: { verdict: 'deducted', amountMinor: 13_800, addedWaterBasisPoints: 240 }, acceptedAddedWaterPercent: 1.1 });
    expect(s.correctedDeduction).toEqual({ addedWaterBasisPoints: 110, amountMinor: 6_325, arithmetic: '12,500 l × 1.10 % × 0.46 EUR/l = €63.25' });
    expect(s.balance).toEqual({ amountMinor: 7_475, payer: 'plant', payee: 'supplier', arithmetic: '€138.00 withheld − €63.25 corrected deduction = €74.75 owed by the plant to the supplier' });
    expect(s.refereeFee).toMatchObject({ borneBy: 'plant' });
    expect(s.refereeFee.reason).toContain('the party that owes the balance');
  });

  it('adjust up: the supplier owes the plant the extra deduction, and bears the fee', () => {
    // Hand-worked example: accepted 3.00 %: 12,500 × 0.03 = 375 l × 0.46 = €172.50; €172.50 − €138.00 = €34.50 owed by the supplier.
    const s = settlementFor({ ...base, outcome: 'adjust', volumeLitres: 12_500, intake: { verdict: 'deducted', amountMinor: 13_800, addedWaterBasisPoints: 240 }, acceptedAddedWaterPercent: 3 });
    expect(s.balance).toMatchObject({ amountMinor: 3_450, payer: 'supplier', payee: 'plant' });
    expect(s.balance.arithmetic).toBe('€172.50 corrected deduction − €138.00 withheld = €34.50 owed by the supplier to the plant');
    expect(s.refereeFee.borneBy).toBe('supplier');
  });

  it('adjust of a rejected load: the whole value less the corrected deduction comes back', () => {
    // Hand-worked example: €4,140.00 withheld; 9,000 l × 3.12 % × 0.46 = 280.8 l × 0.46 = €129.168 → €129.17; owed €4,010.83.
    const s = settlementFor({ ...base, outcome: 'adjust' });
    expect(s.correctedDeduction?.amountMinor).toBe(12_917);
    expect(s.balance).toMatchObject({ amountMinor: 401_083, payer: 'plant' });
  });

  it('refuses an adjustment without an accepted value', () => {
    expect(() => settlementFor({ ...base, outcome: 'adjust', acceptedAddedWaterPercent: null })).toThrow(/accepted value/);
  });

  it('follows a scheme that puts the fee on one party whatever the outcome', () => {
    // The fee of 180 EUR is 18,000 cents; the plant bears it even though it won.
    expect(settlementFor({ ...base, feeBorneBy: 'plant' }).refereeFee).toMatchObject({ amountMinor: 18_000, borneBy: 'plant', reason: 'scheme rule: the plant always bears the fee' });
    expect(settlementFor({ ...base, outcome: 'reverse', feeBorneBy: 'supplier' }).refereeFee.borneBy).toBe('supplier');
  });

  it('says so when the intake recorded another amount than its own formula gives', () => {
    // 9,000 l × 0.46 EUR/l = €4,140.00, but the intake recorded €4,139.99: what was withheld is what was recorded.
    const s = settlementFor({ ...base, outcome: 'reverse', intake: { ...base.intake, amountMinor: 413_999 } });
    expect(s.withheldAtIntake.arithmetic).toBe('9,000 l × 0.46 EUR/l = €4,140.00; recorded at intake: €4,139.99');
    expect(s.balance.amountMinor).toBe(413_999);
  });
});
