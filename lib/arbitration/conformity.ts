import { normalCdf } from './normal';
import { assertPrecision, exceedsCelsius, LIMIT_TO_SIGMA } from './precision';
import type { ConformityResult, DecisionRule, Precision } from './schema';

/** One-sided 95 % quantile of the normal distribution: the guard band is this many standard uncertainties. */
export const GUARD_BAND_COVERAGE = 1.645;

export type LimitSide = 'upper' | 'lower';

export type ConformityInput = {
  value: number;
  /** Readings used by each laboratory whose results were averaged into value, one entry per laboratory. */
  n: readonly number[];
  precision: Precision;
  limit: number;
  side: LimitSide;
  rule: DecisionRule;
};

/**
 * Standard uncertainty of a value that is the mean of k laboratories' results, laboratory i having
 * averaged n_i readings: each laboratory contributes σR² − σr² + σr²/n_i, and the mean of k
 * independent results has the sum of their variances divided by k².
 */
export function standardUncertainty(precision: Precision, n: readonly number[]): number {
  assertPrecision(precision);
  const k = n.length;
  if (k === 0) throw new RangeError('n must name the readings of at least one laboratory');
  const sigmaR = precision.R / LIMIT_TO_SIGMA;
  const sigmaRepeat = precision.r / LIMIT_TO_SIGMA;
  const between = sigmaR * sigmaR - sigmaRepeat * sigmaRepeat;
  let variance = 0;
  for (let i = 0; i < k; i++) {
    const readings = n[i];
    if (!Number.isInteger(readings) || readings < 1) {
      throw new RangeError(`n[${i}] must be a whole number of readings, at least 1, got ${readings}`);
    }
    variance += between + (sigmaRepeat * sigmaRepeat) / readings;
  }
  return Math.sqrt(variance) / k;
}

export function conformity(input: ConformityInput): ConformityResult {
  const { value, limit, side, rule } = input;
  if (!Number.isFinite(value)) throw new RangeError(`value must be a finite number of °C, got ${value}`);
  if (!Number.isFinite(limit)) throw new RangeError(`limit must be a finite number of °C, got ${limit}`);
  const u = standardUncertainty(input.precision, input.n);
  const guardBand = rule === 'simple' ? 0 : GUARD_BAND_COVERAGE * u;
  // Guarded rejection moves the acceptance limit outward (benefit of the doubt to the supplier),
  // guarded acceptance moves it inward (benefit of the doubt to the buyer).
  const outward = rule === 'guarded_rejection' ? guardBand : -guardBand;
  if (side === 'upper') {
    const acceptanceLimit = limit + outward;
    return {
      beyond: exceedsCelsius(value, acceptanceLimit),
      acceptanceLimit,
      guardBand,
      probabilityBeyond: normalCdf((value - limit) / u),
    };
  }
  const acceptanceLimit = limit - outward;
  return {
    beyond: exceedsCelsius(acceptanceLimit, value),
    acceptanceLimit,
    guardBand,
    probabilityBeyond: normalCdf((limit - value) / u),
  };
}
