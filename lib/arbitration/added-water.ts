import { exceedsCelsius } from './precision';
import type { AddedWater } from './schema';

export type AddedWaterInput = { reference: number; sample: number; totalSolids?: number };

/**
 * Added water from the freezing-point depression: W = (T − T′)/T × 100, with T the authentic
 * reference and T′ the sample, optionally scaled by (100 − TS)/100 for the total solids. The ratio
 * is the same whether both are given as freezing points (negative) or as depressions (positive),
 * and whatever the scale, as long as both use the same one.
 */
export function addedWater(input: AddedWaterInput): AddedWater {
  const { reference, sample, totalSolids } = input;
  if (!(Number.isFinite(reference) && reference !== 0)) {
    throw new RangeError(`reference must be a non-zero freezing point, got ${reference}`);
  }
  if (!Number.isFinite(sample)) throw new RangeError(`sample must be a finite freezing point, got ${sample}`);
  if (totalSolids !== undefined && !(Number.isFinite(totalSolids) && totalSolids >= 0 && totalSolids < 100)) {
    throw new RangeError(`totalSolids must be a percentage from 0 to below 100, got ${totalSolids}`);
  }
  // Equal to the reference within arithmetic noise: no water, and no −0 or 1e-14 % to display.
  if (!exceedsCelsius(Math.abs(reference - sample), 0)) return { percent: 0, indicated: false };
  let percent = ((reference - sample) / reference) * 100;
  if (totalSolids !== undefined) percent *= (100 - totalSolids) / 100;
  return { percent, indicated: percent > 0 };
}
