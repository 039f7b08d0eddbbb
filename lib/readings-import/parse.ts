import Papa from 'papaparse';
import { MAX_DATA_ROWS, type Delimiter } from './layout';

/** One data row of the file with the line it started on (the header is line 1 when it comes first). */
export type SourceRow = { line: number; cells: string[] };
export type Table = { header: string[]; rows: SourceRow[]; delimiter: Delimiter };
export type Parsed = { ok: true; table: Table } | { ok: false; message: string };

/**
 * Comma or semicolon, judged on the first non-blank line, the header: a header holds no decimal
 * commas, so a semicolon there means a semicolon-separated file, whatever its numbers look like.
 */
export function detectDelimiter(text: string): Delimiter {
  const first = text.split(/\r\n|\n|\r/).find((line) => line.trim() !== '') ?? '';
  const outsideQuotes = first.replace(/"[^"]*"/g, '');
  const semicolons = outsideQuotes.split(';').length - 1;
  const commas = outsideQuotes.split(',').length - 1;
  return semicolons > 0 && semicolons >= commas ? ';' : ',';
}

const blank = (cells: string[]) => cells.every((c) => c.trim() === '');
const looksNumeric = (cell: string) => /^\s*[-+\u2212\u2013]?\d+([.,]\d+)?\s*$/.test(cell);

/** The file's text as a header and data rows; blank lines are skipped, line numbers kept. */
export function parseTable(text: string, delimiter: Delimiter = detectDelimiter(text)): Parsed {
  const result = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: false, header: false });
  const fatal = result.errors.find((e) => e.type === 'Quotes');
  if (fatal) return { ok: false, message: `Line ${(fatal.row ?? 0) + 1}: a quoted value is not closed. Check the quotation marks in the file.` };

  const lines = result.data.map((cells, i) => ({ line: i + 1, cells: cells.map((c) => c ?? '') })).filter((r) => !blank(r.cells));
  if (lines.length === 0) return { ok: false, message: 'The file holds no readings: it is blank.' };
  const [head, ...rows] = lines;
  if (head.cells.some(looksNumeric) && head.cells.filter((c) => c.trim() !== '').every((c) => looksNumeric(c) || c.trim().length <= 3)) {
    return { ok: false, message: `Line ${head.line} holds numbers, not column names. The first line must name the columns, for example: replicate${delimiter}freezing_point${delimiter}unit` };
  }
  const header = head.cells.map((c) => c.trim());
  if (new Set(header.filter((h) => h !== '').map((h) => h.toLowerCase())).size !== header.filter((h) => h !== '').length) {
    return { ok: false, message: `Line ${head.line}: two columns have the same name. Give each column a name of its own.` };
  }
  if (rows.length === 0) return { ok: false, message: 'The file has column names but no readings below them.' };
  if (rows.length > MAX_DATA_ROWS) return { ok: false, message: `The file has ${rows.length} rows; an import takes at most ${MAX_DATA_ROWS}. Export only the readings of this one sample.` };
  return { ok: true, table: { header, rows, delimiter } };
}
