import { openReadingsFile, validateImport, type ImportTarget, type Mapping } from '@/lib/readings-import';

export const NOW = new Date('2026-03-14T12:00:00Z');
export const intakeTarget: ImportTarget = { calibrationReadings: null, hortvetConversion: 'sucrose_line', now: NOW };
export const retestTarget: ImportTarget = { calibrationReadings: 5, hortvetConversion: 'sucrose_line', now: NOW };

export const bytes = (text: string) => new TextEncoder().encode(text);

/** Opens a file's text and validates it with the proposed mapping, or the one given. */
export function importText(text: string, target: ImportTarget = intakeTarget, change: (m: Mapping) => Mapping = (m) => m) {
  const opened = openReadingsFile(bytes(text));
  if (!opened.ok) throw new Error(`file refused: ${opened.message}`);
  const mapping = change(opened.mapping);
  return { opened, mapping, result: validateImport(opened.table, mapping, target) };
}

/** The problems of one line, as "field: message". */
export const problemsOn = (result: ReturnType<typeof validateImport>, line: number) => result.errors.filter((e) => e.line === line).map((e) => `${e.field}: ${e.message}`);
