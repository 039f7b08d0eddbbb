/**
 * Temperatures are stored as integers of 0.0001 °C ("tenth milli-degrees") so that a comparison
 * at a limit is exact; they are shown in °C with three decimals, differences in m°C.
 */
export const TENTH_MILLI_C_PER_C = 10_000;

const MINUS = '\u2212';

export function toTenthMilliC(celsius: number): number {
  return Math.round(celsius * TENTH_MILLI_C_PER_C);
}

export function fromTenthMilliC(tenthMilliC: number): number {
  return tenthMilliC / TENTH_MILLI_C_PER_C;
}

function signed(text: string, negative: boolean): string {
  return negative ? `${MINUS}${text}` : text;
}

/** −0.5215 °C → "−0.522 °C" (or four decimals when asked). */
export function formatCelsius(tenthMilliC: number, decimals: 3 | 4 = 3): string {
  const celsius = fromTenthMilliC(tenthMilliC);
  const rounded = Math.abs(celsius).toFixed(decimals);
  const isZero = Number(rounded) === 0;
  return `${signed(rounded, celsius < 0 && !isZero)} °C`;
}

/** A difference of 41 tenth-milli-degrees → "4.1 m°C". */
export function formatMilliC(tenthMilliC: number): string {
  const milli = tenthMilliC / 10;
  return `${signed(Math.abs(milli).toFixed(1), milli < 0)} m°C`;
}

/** A storage or sample temperature such as 4.2 °C. */
export function formatStorageCelsius(tenthMilliC: number): string {
  const celsius = fromTenthMilliC(tenthMilliC);
  return `${signed(Math.abs(celsius).toFixed(1), celsius < 0)} °C`;
}
