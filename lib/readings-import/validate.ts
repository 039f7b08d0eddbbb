import type { HortvetConversion } from '@/lib/arbitration';
import { readingFlags, type ReadingFlag } from '@/lib/enums';
import { formatCelsius } from '@/lib/temperature';
import { SAMPLE_READINGS, unitLabels, type ImportField, type ImportUnit } from './layout';
import type { Mapping } from './mapping';
import type { SourceRow, Table } from './parse';
import { formValue, parseNumberCell, parseUnit, toStoredResolution } from './units';

/** What the form importing the file takes, so the file is checked against the same limits. */
export type ImportTarget = {
  /** How many calibration readings the form has places for; null when it takes none (intake). */
  calibrationReadings: number | null;
  /** The scheme's °H conversion, or null to refuse °H. */
  hortvetConversion: HortvetConversion | null;
  /** The sample this set must belong to, when the form knows it. */
  expectedSampleCode?: string | null;
  /** For tests: the moment readings may not lie after. */
  now?: Date;
};

/** One problem, tied to a line of the file and a field, or to the whole set (line null). */
export type RowError = { line: number | null; field: ImportField | 'set'; message: string };

export type Kind = 'sample' | 'calibration';

export type PreviewRow = {
  line: number;
  kind: Kind | null;
  replicate: number | null;
  /** The freezing point as written, with its unit. */
  source: string;
  tenthMilliC: number | null;
  flag: ReadingFlag;
  measuredAt: Date | null;
  sampleCode: string;
  instrument: string;
  analyst: string;
  note: string;
  errors: RowError[];
};

/** The readings shaped exactly as the readings forms hold them. */
export type ImportedValues = {
  readings: { value: string; flag: ReadingFlag }[];
  calibrationReadings: string[];
};

export type ImportMeta = { sampleCode: string | null; instrument: string | null; analyst: string | null; firstMeasuredAt: Date | null; notes: number; convertedFromHortvet: boolean };

export type ImportResult = {
  rows: PreviewRow[];
  /** Every problem: those of rows (also on their row) and those of the set. */
  errors: RowError[];
  /** Only when there is no problem at all: a set is imported whole or not at all. */
  values: ImportedValues | null;
  meta: ImportMeta;
};

const ISO_8601 = /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:?\d{2})?)?$/;
const FUTURE_SLACK_MS = 5 * 60_000;

function parseKind(cell: string): Kind | null {
  const k = cell.trim().toLowerCase();
  if (k === '' || k === 'sample' || k === 'milk') return 'sample';
  if (['calibration', 'cal', 'check', 'standard'].includes(k)) return 'calibration';
  return null;
}

function parseFlag(cell: string): ReadingFlag | null {
  const f = cell.trim().toLowerCase().replace(/[\s-]+/g, '_').replace('crystallization', 'crystallisation');
  if (f === '' || f === 'normal' || f === 'normal_plateau') return 'none';
  if (f === 'early') return 'early_crystallisation';
  if (f === 'no' || f === 'none_crystallised') return 'no_crystallisation';
  return (readingFlags as readonly string[]).includes(f) ? (f as ReadingFlag) : null;
}

function parseInstant(cell: string, now: Date): { ok: true; value: Date | null } | { ok: false; message: string } {
  const text = cell.trim();
  if (text === '') return { ok: true, value: null };
  if (!ISO_8601.test(text)) return { ok: false, message: `“${text}” is not an ISO 8601 date and time, such as 2026-03-14T07:42:00+01:00.` };
  const date = new Date(text.replace(' ', 'T'));
  if (Number.isNaN(date.getTime())) return { ok: false, message: `“${text}” is not a valid date and time.` };
  if (date.getTime() > now.getTime() + FUTURE_SLACK_MS) return { ok: false, message: 'This lies in the future.' };
  return { ok: true, value: date };
}

const cellOf = (row: SourceRow, index: number | null) => (index === null ? '' : (row.cells[index] ?? '').trim());

function readRow(row: SourceRow, mapping: Mapping, target: ImportTarget, now: Date): PreviewRow {
  const c = mapping.columns;
  const errors: RowError[] = [];
  const fail = (field: ImportField, message: string) => errors.push({ line: row.line, field, message });

  const kindCell = cellOf(row, c.kind);
  const kind = parseKind(kindCell);
  if (!kind) fail('kind', `“${kindCell}” is neither sample nor calibration.`);
  if (kind === 'calibration' && target.calibrationReadings === null) {
    fail('kind', 'This form takes no calibration readings: the intake relies on the instrument’s check in force. Leave calibration rows out of this file.');
  }

  const repCell = cellOf(row, c.replicate);
  let replicate: number | null = null;
  if (c.replicate !== null) {
    if (repCell === '') fail('replicate', 'Empty: number the readings 1, 2, 3… in the order taken.');
    else if (!/^\d+$/.test(repCell) || Number(repCell) < 1) fail('replicate', `“${repCell}” is not a replicate number (1, 2, 3…).`);
    else replicate = Number(repCell);
  }

  const unitCell = cellOf(row, c.unit);
  let unit: ImportUnit | null = mapping.unit;
  if (unitCell !== '') {
    unit = parseUnit(unitCell);
    if (!unit) fail('unit', `“${unitCell}” is not a unit this import reads: use m°C, °C or °H.`);
  }

  const valueCell = cellOf(row, c.freezing_point);
  let tenthMilliC: number | null = null;
  const number = parseNumberCell(valueCell, mapping.decimal);
  if (!number.ok) fail('freezing_point', number.message);
  else if (unit) {
    const converted = toStoredResolution(number.value, unit, target.hortvetConversion);
    if (!converted.ok) fail('freezing_point', converted.message);
    else if (converted.tenthMilliC < -10_000 || converted.tenthMilliC > 0) {
      const hint =
        unit === 'C' && number.value >= -1000 && number.value <= -100
          ? ' If the file is in m°C, choose m°C as the unit.'
          : number.value > 0
            ? ' A freezing point of milk is below 0: write it with its minus sign.'
            : '';
      fail('freezing_point', `${valueCell} ${unitLabels[unit]} is outside the range of a freezing point of milk (−1.000 to 0.000 °C).${hint}`);
    } else tenthMilliC = converted.tenthMilliC;
  }

  const flagCell = cellOf(row, c.observation);
  let flag = parseFlag(flagCell);
  if (flag === null) {
    fail('observation', `“${flagCell}” is not an observation this import reads: use normal, early_crystallisation or no_crystallisation.`);
    flag = 'none';
  } else if (flag !== 'none' && kind === 'calibration') fail('observation', 'Observations are kept for readings of the sample only.');

  const instant = parseInstant(cellOf(row, c.measured_at), now);
  if (!instant.ok) fail('measured_at', instant.message);

  return {
    line: row.line,
    kind,
    replicate,
    source: unit && valueCell !== '' ? `${valueCell} ${unitLabels[unit]}` : valueCell,
    tenthMilliC,
    flag,
    measuredAt: instant.ok ? instant.value : null,
    sampleCode: cellOf(row, c.sample_code),
    instrument: cellOf(row, c.instrument),
    analyst: cellOf(row, c.analyst),
    note: cellOf(row, c.note),
    errors,
  };
}

/** Replicates of one kind: each once, numbered 1..n without a gap, so no reading was left out. */
function checkReplicates(rows: PreviewRow[], kind: Kind, setErrors: RowError[]): void {
  const firstLine = new Map<number, number>();
  for (const row of rows) {
    if (row.replicate === null) continue;
    const first = firstLine.get(row.replicate);
    if (first !== undefined) row.errors.push({ line: row.line, field: 'replicate', message: `Replicate ${row.replicate} appears twice (also on line ${first}).` });
    else firstLine.set(row.replicate, row.line);
  }
  const numbers = [...firstLine.keys()].sort((a, b) => a - b);
  const missing = numbers.length ? Array.from({ length: numbers[numbers.length - 1] }, (_, i) => i + 1).filter((n) => !firstLine.has(n)) : [];
  if (missing.length) {
    setErrors.push({ line: null, field: 'set', message: `${kind === 'sample' ? 'Sample' : 'Calibration'} replicate${missing.length === 1 ? '' : 's'} ${missing.join(', ')} ${missing.length === 1 ? 'is' : 'are'} missing: number the readings 1 to ${numbers[numbers.length - 1]} in the order taken, leaving none out.` });
  }
}

/** All rows of one column agree, or each row that differs from the first says so. */
function checkSame(rows: PreviewRow[], pick: (r: PreviewRow) => string, field: ImportField, what: string): void {
  const first = rows.find((r) => pick(r) !== '');
  if (!first) return;
  for (const row of rows) {
    const value = pick(row);
    if (value !== '' && value !== pick(first)) row.errors.push({ line: row.line, field, message: `${what} “${value}” differs from “${pick(first)}” on line ${first.line}: one file holds one measurement set.` });
  }
}

const ordered = (rows: PreviewRow[]) => [...rows].sort((a, b) => (a.replicate ?? 0) - (b.replicate ?? 0) || a.line - b.line);
const count = (n: number, what: string) => `${n} ${what}${n === 1 ? '' : 's'}`;

/** The table read through the mapping, each row checked, and the readings when all is well. */
export function validateImport(table: Table, mapping: Mapping, target: ImportTarget): ImportResult {
  const now = target.now ?? new Date();
  const rows = table.rows.map((r) => readRow(r, mapping, target, now));
  const setErrors: RowError[] = [];
  const samples = rows.filter((r) => r.kind === 'sample');
  const calibration = rows.filter((r) => r.kind === 'calibration');

  if (mapping.columns.replicate !== null) {
    checkReplicates(samples, 'sample', setErrors);
    checkReplicates(calibration, 'calibration', setErrors);
  }
  checkSame(samples, (r) => r.sampleCode, 'sample_code', 'Sample code');
  checkSame(rows, (r) => r.instrument, 'instrument', 'Instrument');
  const expected = target.expectedSampleCode?.trim();
  if (expected) {
    for (const row of samples) {
      if (row.sampleCode !== '' && row.sampleCode.toLowerCase() !== expected.toLowerCase()) {
        row.errors.push({ line: row.line, field: 'sample_code', message: `This file is for sample “${row.sampleCode}”; the sample here is “${expected}”.` });
      }
    }
  }

  const rowErrors = rows.flatMap((r) => r.errors);
  const usable = rows.filter((r) => r.errors.length === 0);
  if (rowErrors.length > 0 && usable.length === 0) {
    setErrors.unshift({ line: null, field: 'set', message: 'No row of this file can be used: every row has a problem, listed beside it.' });
  }
  if (samples.length < SAMPLE_READINGS.min) setErrors.push({ line: null, field: 'set', message: `The file has ${count(samples.length, 'reading')} of the sample; at least ${SAMPLE_READINGS.min} are needed.` });
  if (samples.length > SAMPLE_READINGS.max) setErrors.push({ line: null, field: 'set', message: `The file has ${count(samples.length, 'reading')} of the sample; the form takes at most ${SAMPLE_READINGS.max}.` });
  // A file without calibration rows leaves the form's calibration check to be typed.
  if (target.calibrationReadings !== null && calibration.length > 0 && calibration.length !== target.calibrationReadings) {
    setErrors.push({ line: null, field: 'set', message: `The scheme’s calibration check takes ${count(target.calibrationReadings, 'reading')} on the standard; the file has ${calibration.length}.` });
  }

  const errors = [...setErrors, ...rowErrors];
  const sampleRows = ordered(samples);
  const values: ImportedValues | null =
    errors.length === 0
      ? {
          readings: sampleRows.map((r) => ({ value: formValue(r.tenthMilliC!), flag: r.flag })),
          calibrationReadings: ordered(calibration).map((r) => formValue(r.tenthMilliC!)),
        }
      : null;

  const firstOf = (pick: (r: PreviewRow) => string) => rows.map(pick).find((v) => v !== '') ?? null;
  const times = sampleRows.map((r) => r.measuredAt).filter((d): d is Date => d !== null);
  return {
    rows,
    errors,
    values,
    meta: {
      sampleCode: firstOf((r) => (r.kind === 'sample' ? r.sampleCode : '')),
      instrument: firstOf((r) => r.instrument),
      analyst: firstOf((r) => r.analyst),
      firstMeasuredAt: times.length ? new Date(Math.min(...times.map((d) => d.getTime()))) : null,
      notes: rows.filter((r) => r.note !== '').length,
      convertedFromHortvet: rows.some((r) => r.source.endsWith(unitLabels.H)),
    },
  };
}

/** The value as the preview shows it. */
export const previewCelsius = (tenthMilliC: number | null) => (tenthMilliC === null ? '' : formatCelsius(tenthMilliC, 4));
