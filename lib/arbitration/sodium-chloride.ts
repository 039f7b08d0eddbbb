import { exceedsCelsius } from './precision';

// ISO 5764:2009, Table 1: sodium chloride calibration standards, g NaCl per kg of water, against
// the freezing point they give. Ordered from the warmest standard to the coldest.
const TABLE: readonly { freezingPoint: number; gramsPerKg: number }[] = [
  { freezingPoint: -0.4, gramsPerKg: 6.763 },
  { freezingPoint: -0.408, gramsPerKg: 6.901 },
  { freezingPoint: -0.45, gramsPerKg: 7.625 },
  { freezingPoint: -0.5, gramsPerKg: 8.489 },
  { freezingPoint: -0.51, gramsPerKg: 8.662 },
  { freezingPoint: -0.512, gramsPerKg: 8.697 },
  { freezingPoint: -0.52, gramsPerKg: 8.835 },
  { freezingPoint: -0.53, gramsPerKg: 9.008 },
  { freezingPoint: -0.54, gramsPerKg: 9.181 },
  { freezingPoint: -0.55, gramsPerKg: 9.354 },
  { freezingPoint: -0.557, gramsPerKg: 9.475 },
  { freezingPoint: -0.6, gramsPerKg: 10.22 },
];

export const SODIUM_CHLORIDE_TABLE = TABLE;

/**
 * Grams of sodium chloride per kg of water for a standard of the given freezing point, linear
 * between the table's rows. Outside the table the relation is not given, so it is not guessed.
 */
export function sodiumChlorideFor(freezingPoint: number): number {
  const warmest = TABLE[0];
  const coldest = TABLE[TABLE.length - 1];
  if (
    !Number.isFinite(freezingPoint) ||
    exceedsCelsius(freezingPoint, warmest.freezingPoint) ||
    exceedsCelsius(coldest.freezingPoint, freezingPoint)
  ) {
    throw new RangeError(`sodiumChlorideFor: ${freezingPoint} °C is outside ISO 5764 Table 1 (−0.400 to −0.600 °C)`);
  }
  for (let i = 1; i < TABLE.length; i++) {
    const warmer = TABLE[i - 1];
    const colder = TABLE[i];
    // A standard that is one of the rows, within arithmetic noise, gets the row's own value.
    if (!exceedsCelsius(Math.abs(freezingPoint - warmer.freezingPoint), 0)) return warmer.gramsPerKg;
    if (!exceedsCelsius(Math.abs(freezingPoint - colder.freezingPoint), 0)) return colder.gramsPerKg;
    if (freezingPoint > colder.freezingPoint) {
      const share = (freezingPoint - warmer.freezingPoint) / (colder.freezingPoint - warmer.freezingPoint);
      return warmer.gramsPerKg + share * (colder.gramsPerKg - warmer.gramsPerKg);
    }
  }
  return coldest.gramsPerKg;
}
