/**
 * Our own CSV layout for the readings of one measurement set, and the limits of an import.
 * The layout is documented for the laboratories on the "Readings CSV layout" page; keep the two in step.
 */

/** The fields a column of the file can feed, in the order the preview and the mapping step show them. */
export const importFields = ['kind', 'replicate', 'freezing_point', 'unit', 'observation', 'measured_at', 'sample_code', 'instrument', 'analyst', 'note'] as const;
export type ImportField = (typeof importFields)[number];

export const fieldLabels: Record<ImportField, string> = {
  kind: 'Kind (sample or calibration)',
  replicate: 'Replicate number',
  freezing_point: 'Freezing point',
  unit: 'Unit',
  observation: 'Observation',
  measured_at: 'Measured at',
  sample_code: 'Sample code',
  instrument: 'Instrument',
  analyst: 'Analyst',
  note: 'Note',
};

/** The units a freezing point may be written in. °H needs the scheme's conversion to become °C. */
export const importUnits = ['mC', 'C', 'H'] as const;
export type ImportUnit = (typeof importUnits)[number];
export const unitLabels: Record<ImportUnit, string> = { mC: 'm°C', C: '°C', H: '°H' };

export const delimiters = [',', ';'] as const;
export type Delimiter = (typeof delimiters)[number];
export const decimalSeparators = ['.', ','] as const;
export type DecimalSeparator = (typeof decimalSeparators)[number];

// A measurement set is a handful of rows: a quarter of a megabyte or a few hundred lines is already
// far beyond any real file, and keeps a wrong file (an export of a whole instrument log) from
// freezing the browser.
export const MAX_FILE_BYTES = 256 * 1024;
export const MAX_DATA_ROWS = 200;

/** The readings the forms take: the same bounds as the server's schemas. */
export const SAMPLE_READINGS = { min: 2, max: 10 } as const;

/** A header cell as compared: case, spaces, hyphens and a trailing unit in brackets do not matter. */
export function normaliseHeader(cell: string): string {
  return cell
    .trim()
    .toLowerCase()
    .replace(/\s*[([].*[)\]]\s*$/, '')
    .replace(/[\s-]+/g, '_');
}

// Foreign headers the mapping step proposes for a field before the user confirms or changes it.
// Only guesses: nothing is imported until the preview is clean and the user takes it.
export const headerGuesses: Record<ImportField, RegExp> = {
  kind: /^(kind|type|row_type|reading_type)$/,
  replicate: /^((rep|replicate|repeat|reading|run|seq|sequence)(_?(no|nr|number|#))?|no|nr|n|#)$/,
  freezing_point: /(freezing|^fp$|^fpd$|^value$|^result$|^reading$|^temperature$|^temp$)/,
  unit: /^(unit|units|scale)$/,
  observation: /^(observation|flag|crystallisation|crystallization|plateau)$/,
  measured_at: /(measured_at|timestamp|date_time|datetime|^time$|^date$|^measured$|tested_at)/,
  sample_code: /(sample|specimen)/,
  instrument: /(instrument|serial|device|cryoscope|analyser|analyzer)/,
  analyst: /(analyst|operator|^user$|technician|tested_by)/,
  note: /(note|comment|remark)/,
};
