import { addedWater, conformity } from '@/lib/arbitration';
import type { SchemeRules } from '@/lib/rules/schema';
import { toMinor } from '@/lib/money/minor-units';

export type IntakeVerdictInput = {
  /** The measurement set's final result, °C. */
  value: number;
  /** Readings the final result used. */
  readingsUsed: number;
  volumeLitres: number;
  rules: SchemeRules;
};

export type IntakeVerdictResult = {
  verdict: 'accepted' | 'deducted' | 'rejected';
  /** Which limit decided it, if any. */
  limitApplied: 'upper' | 'lower' | null;
  limit: number;
  acceptanceLimit: number;
  addedWaterPercent: number;
  amountMinor: number;
  arithmetic: string;
};

/**
 * The plant's verdict on one delivery. Colder than the lower limit points to added solutes: the load
 * is rejected. Warmer than the upper limit points to added water: rejected when the added water
 * reaches the scheme's rejection share, otherwise paid less by the added-water share of the volume.
 * Both limits are tested under the scheme's decision rule, so a guard band applies where it says so.
 */
export function intakeVerdict(input: IntakeVerdictInput): IntakeVerdictResult {
  const { rules, value, readingsUsed, volumeLitres } = input;
  const common = { value, n: [readingsUsed], precision: rules.precision, rule: rules.decisionRule };
  const water = addedWater({ reference: rules.referenceFreezingPoint, sample: value });
  const addedWaterPercent = water.indicated ? water.percent : 0;
  const price = rules.money.milkPricePerLitre;

  if (rules.limits.lower !== undefined) {
    const lower = conformity({ ...common, limit: rules.limits.lower, side: 'lower' });
    if (lower.beyond) {
      const amountMinor = toMinor(volumeLitres * price, rules.currency);
      return {
        verdict: 'rejected',
        limitApplied: 'lower',
        limit: rules.limits.lower,
        acceptanceLimit: lower.acceptanceLimit,
        addedWaterPercent: 0,
        amountMinor,
        arithmetic: `${volumeLitres} l × ${price} ${rules.currency}/l`,
      };
    }
  }
  const upper = conformity({ ...common, limit: rules.limits.upper, side: 'upper' });
  if (!upper.beyond) {
    return {
      verdict: 'accepted',
      limitApplied: null,
      limit: rules.limits.upper,
      acceptanceLimit: upper.acceptanceLimit,
      addedWaterPercent,
      amountMinor: 0,
      arithmetic: 'nothing withheld',
    };
  }
  if (addedWaterPercent >= rules.rejectionAddedWaterPercent) {
    return {
      verdict: 'rejected',
      limitApplied: 'upper',
      limit: rules.limits.upper,
      acceptanceLimit: upper.acceptanceLimit,
      addedWaterPercent,
      amountMinor: toMinor(volumeLitres * price, rules.currency),
      arithmetic: `${volumeLitres} l × ${price} ${rules.currency}/l`,
    };
  }
  const share = addedWaterPercent / 100;
  return {
    verdict: 'deducted',
    limitApplied: 'upper',
    limit: rules.limits.upper,
    acceptanceLimit: upper.acceptanceLimit,
    addedWaterPercent,
    amountMinor: toMinor(volumeLitres * share * price, rules.currency),
    arithmetic: `${volumeLitres} l × ${addedWaterPercent.toFixed(2)} % × ${price} ${rules.currency}/l`,
  };
}
