/**
 * Degrees Hortvet (°H) are an older freezing-point scale still written into some contracts. Two
 * conversions are in use and they differ by about 2 m°C near −0.525 °H, so a scheme states which
 * one it follows.
 */
export type HortvetConversion = 'factor' | 'sucrose_line';

/** °C per °H, as used in the trade. */
export const HORTVET_FACTOR = 0.9658;

// AOAC 961.07 sucrose standards, given on both scales.
const SUCROSE_LOW = { hortvet: -0.422, celsius: -0.408 } as const;
const SUCROSE_HIGH = { hortvet: -0.621, celsius: -0.6 } as const;

const SUCROSE_SLOPE = (SUCROSE_HIGH.celsius - SUCROSE_LOW.celsius) / (SUCROSE_HIGH.hortvet - SUCROSE_LOW.hortvet);
const SUCROSE_INTERCEPT = SUCROSE_LOW.celsius - SUCROSE_SLOPE * SUCROSE_LOW.hortvet;

function assertFinite(value: number, unit: string): void {
  if (!Number.isFinite(value)) throw new RangeError(`expected a finite number of ${unit}, got ${value}`);
}

export function hortvetToCelsius(hortvet: number, conversion: HortvetConversion): number {
  assertFinite(hortvet, '°H');
  return conversion === 'factor' ? HORTVET_FACTOR * hortvet : SUCROSE_SLOPE * hortvet + SUCROSE_INTERCEPT;
}

export function celsiusToHortvet(celsius: number, conversion: HortvetConversion): number {
  assertFinite(celsius, '°C');
  return conversion === 'factor' ? celsius / HORTVET_FACTOR : (celsius - SUCROSE_INTERCEPT) / SUCROSE_SLOPE;
}

/** The sucrose line as °C = slope·°H + intercept, for display on the rules page. */
export const SUCROSE_LINE = { slope: SUCROSE_SLOPE, intercept: SUCROSE_INTERCEPT } as const;
