import {
  asTenths,
  assertPrecision,
  criticalRangeFactor,
  fromTenths,
  LIMIT_TO_SIGMA,
  toTenths,
  withinTenths,
} from './precision';
import type { FinalResult, Precision } from './schema';

function assertReading(reading: number, index: number): void {
  if (!Number.isFinite(reading)) {
    throw new RangeError(`readings[${index}] must be a finite number of °C, got ${reading}`);
  }
}

/** Median of four values, whatever their order: the mean of the two middle ones. */
export function medianOfFour(a: number, b: number, c: number, d: number): number {
  // The two middle values of four are the larger of the pair minima and the smaller of the pair maxima.
  const low = Math.max(Math.min(a, b), Math.min(c, d));
  const high = Math.min(Math.max(a, b), Math.max(c, d));
  return (low + high) / 2;
}

/**
 * ISO 5725-6 repeatability procedure for one laboratory's readings, in the order measured.
 * Readings past the ones the procedure uses are ignored; the caller reports them.
 */
export function finalResult(readings: readonly number[], precision: Precision): FinalResult {
  assertPrecision(precision);
  const count = readings.length;
  for (let i = 0; i < count && i < 4; i++) assertReading(readings[i], i);

  if (count < 2) return { status: 'needs_more_readings', needed: 2 - count };

  // Integer tenths of m°C, so the difference and the range are exact.
  const t1 = toTenths(readings[0]);
  const t2 = toTenths(readings[1]);
  const rTenths = asTenths(precision.r);

  if (withinTenths(Math.abs(t1 - t2), rTenths)) {
    return { status: 'accepted', value: fromTenths((t1 + t2) / 2), basis: 'mean_of_2', used: 2 };
  }
  if (count < 4) return { status: 'needs_more_readings', needed: 4 - count };

  const t3 = toTenths(readings[2]);
  const t4 = toTenths(readings[3]);
  const range = Math.max(t1, t2, t3, t4) - Math.min(t1, t2, t3, t4);
  // CR0.95(4) = f(4)·σr with σr = r/2.8.
  const criticalRange = (criticalRangeFactor(4) * rTenths) / LIMIT_TO_SIGMA;

  if (withinTenths(range, criticalRange)) {
    return { status: 'accepted', value: fromTenths((t1 + t2 + t3 + t4) / 4), basis: 'mean_of_4', used: 4 };
  }
  return { status: 'accepted', value: fromTenths(medianOfFour(t1, t2, t3, t4)), basis: 'median_of_4', used: 4 };
}

/** The critical range of four readings, °C, as finalResult applies it. */
export function criticalRangeOfFour(precision: Precision): number {
  return (criticalRangeFactor(4) * precision.r) / LIMIT_TO_SIGMA;
}
