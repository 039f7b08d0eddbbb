import { hortvetToCelsius, type HortvetConversion } from '@/lib/arbitration';
import { fromTenthMilliC, toTenthMilliC } from '@/lib/temperature';
import type { DecimalSeparator, ImportUnit } from './layout';

const MINUS = /[\u2212\u2013]/g;

/** A unit as written in a `unit` cell: m°C, °C or °H, with or without the degree sign. */
export function parseUnit(cell: string): ImportUnit | null {
  const u = cell.trim().toLowerCase().replace(/[°º˚\s]/g, '').replace(/^deg/, '');
  if (['mc', 'mdegc', 'millic', 'millidegc', 'millicelsius'].includes(u)) return 'mC';
  if (['c', 'degc', 'celsius'].includes(u)) return 'C';
  if (['h', 'degh', 'hortvet'].includes(u)) return 'H';
  return null;
}

export type NumberCell = { ok: true; value: number } | { ok: false; message: string };

/**
 * A number as the file writes it, with the chosen decimal separator only: no thousands separators,
 * no exponents. The minus sign may be the typographic one.
 */
export function parseNumberCell(cell: string, decimal: DecimalSeparator): NumberCell {
  const text = cell.trim().replace(MINUS, '-');
  if (text === '') return { ok: false, message: 'Empty: enter the reading.' };
  const other = decimal === ',' ? '.' : ',';
  if (text.includes(other)) {
    return { ok: false, message: `“${cell.trim()}” uses a decimal ${other === ',' ? 'comma' : 'point'}, but the file is read with a decimal ${decimal === ',' ? 'comma' : 'point'}. Change the decimal separator or correct the value.` };
  }
  const plain = decimal === ',' ? text.replace(',', '.') : text;
  if (!/^[-+]?(\d+(\.\d*)?|\.\d+)$/.test(plain)) return { ok: false, message: `“${cell.trim()}” is not a number.` };
  return { ok: true, value: Number(plain) };
}

export type Converted = { ok: true; tenthMilliC: number; rounded: boolean } | { ok: false; message: string };

const fits = (x: number) => Math.abs(x - Math.round(x)) < 1e-6;

/**
 * A value in the given unit as integer tenths of m°C, the resolution the product stores. m°C and °C
 * must already be at that resolution, as typed readings must; °H values are converted with the
 * scheme's conversion and rounded to it, because no °H value lands on it exactly.
 */
export function toStoredResolution(value: number, unit: ImportUnit, hortvet: HortvetConversion | null): Converted {
  if (unit === 'mC') {
    const tenths = value * 10;
    return fits(tenths) ? { ok: true, tenthMilliC: Math.round(tenths), rounded: false } : { ok: false, message: 'Use at most one decimal in m°C (0.1 m°C resolution).' };
  }
  if (unit === 'C') {
    const tenths = value * 10_000;
    return fits(tenths) ? { ok: true, tenthMilliC: Math.round(tenths), rounded: false } : { ok: false, message: 'Use at most four decimals in °C.' };
  }
  if (!hortvet) return { ok: false, message: 'This form does not know the scheme’s °H conversion: give the readings in °C or m°C.' };
  return { ok: true, tenthMilliC: toTenthMilliC(hortvetToCelsius(value, hortvet)), rounded: true };
}

/** The stored value as the forms' text inputs take it: °C with four decimals and a plain minus. */
export function formValue(tenthMilliC: number): string {
  return fromTenthMilliC(tenthMilliC).toFixed(4);
}
