import type { Precision } from './schema';

/**
 * How the module compares at 0.0001 °C resolution.
 *
 * A cryoscope reports a freezing point to 0.0001 °C (one tenth of a m°C). Readings are therefore
 * snapped to integer tenths of m°C before anything is computed from them: that only removes the
 * binary floating-point noise of the decimal input, so differences and ranges of readings are exact
 * integers (|−0.520 − (−0.524)| is exactly 40 tenths, not 0.004000000000000004 °C).
 *
 * Limits (r, a calibration tolerance, the critical range, a critical difference, an acceptance
 * limit) are real numbers and are never rounded: a range of 0.0051 °C is within the critical range
 * of four readings, 3.6 × 0.004 / 2.8 = 0.0051428… °C, and 0.0052 °C is over it; a difference of
 * 0.0051 °C is over the critical difference of 0.005099 °C. Averages of readings are not rounded
 * either, since rounding a mean to the grid would move it by up to 0.05 m°C for no reason.
 *
 * Every "within" comparison allows COMPARISON_NOISE_TENTHS on top of the limit. It is a million
 * times smaller than the resolution, so it can only absorb arithmetic noise, never a real step.
 */
export const TENTHS_PER_DEGREE = 10_000;

/** 1e-6 tenths of m°C = 1e-10 °C. */
const COMPARISON_NOISE_TENTHS = 1e-6;

/** The factor between a 95 % limit and a standard deviation: 1.96 × √2, rounded as ISO 5725-6 does. */
export const LIMIT_TO_SIGMA = 2.8;

/** Snaps a temperature in °C to integer tenths of m°C. */
export function toTenths(celsius: number): number {
  return Math.round(celsius * TENTHS_PER_DEGREE);
}

/** A temperature in (possibly fractional) tenths of m°C, without snapping. */
export function asTenths(celsius: number): number {
  return celsius * TENTHS_PER_DEGREE;
}

export function fromTenths(tenths: number): number {
  return tenths / TENTHS_PER_DEGREE;
}

/** measured ≤ limit, both in tenths of m°C; equality within arithmetic noise counts as within. */
export function withinTenths(measured: number, limit: number): boolean {
  return measured <= limit + COMPARISON_NOISE_TENTHS;
}

/** a > b by more than arithmetic noise, both in °C. */
export function exceedsCelsius(a: number, b: number): boolean {
  return (a - b) * TENTHS_PER_DEGREE > COMPARISON_NOISE_TENTHS;
}

/** |a − b| ≤ limit at resolution, all in °C. */
export function differenceWithin(a: number, b: number, limit: number): boolean {
  return withinTenths(Math.abs(asTenths(a) - asTenths(b)), asTenths(limit));
}

// ISO 5725-6:1994, Table 1: the critical range factor f(n), the 95 % quantile of the range of n
// results from a normal distribution, in units of the standard deviation.
const CRITICAL_RANGE_FACTORS: readonly number[] = [Number.NaN, Number.NaN, 2.8, 3.3, 3.6, 3.9, 4.0, 4.2, 4.3, 4.4, 4.5];

export function criticalRangeFactor(n: number): number {
  if (!Number.isInteger(n) || n < 2 || n > 10) {
    throw new RangeError(`criticalRangeFactor: n must be an integer from 2 to 10, got ${n}`);
  }
  return CRITICAL_RANGE_FACTORS[n];
}

export function assertPrecision(precision: Precision): void {
  const { r, R } = precision;
  if (!(Number.isFinite(r) && r > 0)) {
    throw new RangeError(`precision.r must be a positive number of °C, got ${r}`);
  }
  if (!(Number.isFinite(R) && R >= r)) {
    throw new RangeError(`precision.R must be a number of °C not below r (${r}), got ${R}`);
  }
}

function assertCount(name: string, n: number): void {
  if (!Number.isInteger(n) || n < 1) {
    throw new RangeError(`${name} must be a whole number of results, at least 1, got ${n}`);
  }
}

/** ISO 5725-6 critical difference between two laboratories' means of n1 and n2 results. */
export function criticalDifference(precision: Precision, n1: number, n2: number): number {
  assertPrecision(precision);
  assertCount('n1', n1);
  assertCount('n2', n2);
  const { r, R } = precision;
  return Math.sqrt(R * R - r * r * (1 - 1 / (2 * n1) - 1 / (2 * n2)));
}

/**
 * Strips arithmetic noise from a value built from readings (a mean, a mean of means, a difference).
 * Such values are exact multiples of 0.0000125 °C at worst, so rounding to 1e-8 °C loses nothing
 * and keeps −0.5107 from showing as −0.5106999999999999.
 */
export function withoutNoise(celsius: number): number {
  return Math.round(celsius * 1e8) / 1e8;
}
