import { asTenths, toTenths, withinTenths } from './precision';

export type CalibrationCheckInput = {
  nominal: number;
  readings: readonly number[];
  tolerance: number;
  required: number;
};

export type CalibrationCheckResult = { pass: boolean; within: number; total: number };

/**
 * A k-of-n check of the instrument on a standard of known freezing point. The trade's usual form
 * is at least 3 of 5 readings within ±0.004 °C of a −0.512 °C standard; the scheme sets k and the
 * tolerance.
 */
export function calibrationCheck(input: CalibrationCheckInput): CalibrationCheckResult {
  const { nominal, readings, tolerance, required } = input;
  if (!Number.isFinite(nominal)) throw new RangeError(`nominal must be a finite number of °C, got ${nominal}`);
  if (!(Number.isFinite(tolerance) && tolerance >= 0)) {
    throw new RangeError(`tolerance must be a number of °C, 0 or more, got ${tolerance}`);
  }
  if (!Number.isInteger(required) || required < 1) {
    throw new RangeError(`required must be a whole number of readings, at least 1, got ${required}`);
  }
  const nominalTenths = toTenths(nominal);
  const toleranceTenths = asTenths(tolerance);
  let within = 0;
  for (let i = 0; i < readings.length; i++) {
    const reading = readings[i];
    if (!Number.isFinite(reading)) throw new RangeError(`readings[${i}] must be a finite number of °C, got ${reading}`);
    if (withinTenths(Math.abs(toTenths(reading) - nominalTenths), toleranceTenths)) within++;
  }
  return { pass: within >= required, within, total: readings.length };
}
