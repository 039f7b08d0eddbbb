import { z } from 'zod';
import { decimalSeparators, delimiters, headerGuesses, importFields, importUnits, normaliseHeader, type DecimalSeparator, type ImportField } from './layout';
import type { Table } from './parse';
import { parseUnit } from './units';

const column = z.number().int().min(0).nullable().default(null);

/**
 * Which column of the file feeds which field, the unit of values whose row names none, and the
 * separators. Our own layout gives it directly; any other file gets it from the mapping step.
 */
export const mappingSchema = z
  .object({
    columns: z.object(Object.fromEntries(importFields.map((f) => [f, column])) as Record<ImportField, typeof column>),
    unit: z.enum(importUnits, { error: 'Choose the unit of the freezing points.' }),
    decimal: z.enum(decimalSeparators, { error: 'Choose the decimal separator.' }),
    delimiter: z.enum(delimiters, { error: 'Choose the column separator.' }),
  })
  .superRefine((m, ctx) => {
    if (m.columns.freezing_point === null) ctx.addIssue({ code: 'custom', path: ['columns', 'freezing_point'], message: 'Choose the column that holds the freezing points.' });
    const seen = new Map<number, ImportField>();
    for (const field of importFields) {
      const index = m.columns[field];
      if (index === null) continue;
      const other = seen.get(index);
      if (other) ctx.addIssue({ code: 'custom', path: ['columns', field], message: `This column already feeds “${other.replace('_', ' ')}”.` });
      else seen.set(index, field);
    }
  });
export type Mapping = z.output<typeof mappingSchema>;
export type MappingInput = z.input<typeof mappingSchema>;

const emptyColumns = (): Record<ImportField, number | null> => Object.fromEntries(importFields.map((f) => [f, null])) as Record<ImportField, number | null>;

/** The columns of our layout when every header names one of its fields and freezing_point is there. */
export function ourLayoutColumns(header: readonly string[]): Record<ImportField, number | null> | null {
  const columns = emptyColumns();
  for (const [index, cell] of header.entries()) {
    const name = normaliseHeader(cell);
    if (name === '') continue;
    if (!(importFields as readonly string[]).includes(name)) return null;
    columns[name as ImportField] = index;
  }
  return columns.freezing_point === null ? null : columns;
}

/** A first proposal for a foreign header; the user checks it in the mapping step. */
export function guessColumns(header: readonly string[]): Record<ImportField, number | null> {
  const columns = emptyColumns();
  const taken = new Set<number>();
  // Narrow fields first, so "sample_fp" goes to the freezing point before "sample" claims it.
  const order: ImportField[] = ['freezing_point', 'replicate', 'unit', 'kind', 'observation', 'measured_at', 'instrument', 'analyst', 'sample_code', 'note'];
  for (const field of order) {
    const index = header.findIndex((cell, i) => !taken.has(i) && headerGuesses[field].test(normaliseHeader(cell)));
    if (index >= 0) {
      columns[field] = index;
      taken.add(index);
    }
  }
  return columns;
}

/**
 * The decimal separator the freezing points use: a comma in any of them (written as 0,512 or
 * quoted in a comma-separated file) means a decimal comma.
 */
export function detectDecimal(table: Table, freezingPointColumn: number | null): DecimalSeparator {
  if (freezingPointColumn === null) return table.delimiter === ';' ? ',' : '.';
  const cells = table.rows.map((r) => r.cells[freezingPointColumn] ?? '');
  if (cells.some((c) => /^\s*[-+\u2212\u2013]?\d*,\d+\s*$/.test(c))) return ',';
  return '.';
}

/** Columns that hold at least one number: those could be freezing points. */
export function numericColumns(table: Table): number[] {
  return table.header.map((_, i) => i).filter((i) => table.rows.some((r) => /^\s*[-+\u2212\u2013]?\d+([.,]\d+)?\s*$/.test(r.cells[i] ?? '')));
}

export type Proposal = { mapping: Mapping; ourLayout: boolean } | { mapping: null; message: string };

/** The mapping to start from: our layout when the header is ours, otherwise the best guesses. */
export function proposeMapping(table: Table): Proposal {
  const ours = ourLayoutColumns(table.header);
  const columns = ours ?? guessColumns(table.header);
  if (columns.freezing_point === null) {
    const numeric = numericColumns(table);
    if (numeric.length === 0) {
      return { mapping: null, message: 'Nothing in this file can be imported: no column holds numbers that could be freezing points.' };
    }
    columns.freezing_point = numeric.find((i) => !Object.values(columns).includes(i)) ?? numeric[0];
  }
  // A unit in the freezing point's header, as in "FP [mC]", is the best first guess for rows that name none.
  const headerUnit = parseUnit(table.header[columns.freezing_point]?.match(/[([]([^)\]]*)[)\]]\s*$/)?.[1] ?? '');
  const mapping: Mapping = { columns, unit: headerUnit ?? 'C', decimal: detectDecimal(table, columns.freezing_point), delimiter: table.delimiter };
  return { mapping, ourLayout: ours !== null };
}
