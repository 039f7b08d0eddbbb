// Readings of one measurement set imported from a CSV file: decoded, parsed, mapped onto our
// fields, checked row by row and shaped as the readings forms hold them. Pure: no framework, no
// I/O, so the browser runs it on a file the user picks and tests run it on bytes.

import { decodeCsvBytes } from './decode';
import type { Delimiter } from './layout';
import { proposeMapping, type Mapping } from './mapping';
import { parseTable, type Table } from './parse';

export * from './layout';
export { decodeCsvBytes } from './decode';
export { detectDelimiter, parseTable, type SourceRow, type Table } from './parse';
export { detectDecimal, guessColumns, mappingSchema, numericColumns, ourLayoutColumns, proposeMapping, type Mapping } from './mapping';
export { matchInstrument } from './instrument';
export { formValue, parseNumberCell, parseUnit, toStoredResolution } from './units';
export { previewCelsius, validateImport, type ImportMeta, type ImportResult, type ImportTarget, type ImportedValues, type PreviewRow, type RowError } from './validate';

export type OpenedFile = { ok: true; table: Table; mapping: Mapping; ourLayout: boolean; hadBom: boolean } | { ok: false; message: string };

/** A file's bytes up to the mapping to start from; `delimiter` re-reads it with another separator. */
export function openReadingsFile(bytes: Uint8Array, delimiter?: Delimiter): OpenedFile {
  const decoded = decodeCsvBytes(bytes);
  if (!decoded.ok) return decoded;
  const parsed = parseTable(decoded.text, delimiter);
  if (!parsed.ok) return parsed;
  const proposal = proposeMapping(parsed.table);
  if (!proposal.mapping) return { ok: false, message: proposal.message };
  return { ok: true, table: parsed.table, mapping: proposal.mapping, ourLayout: proposal.ourLayout, hadBom: decoded.hadBom };
}
