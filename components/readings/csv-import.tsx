'use client';

import Link from 'next/link';
import { useId, useMemo, useState } from 'react';
import { mappingSchema, openReadingsFile, validateImport, type Delimiter, type ImportedValues, type ImportMeta, type ImportTarget, type Mapping, type Table } from '@/lib/readings-import';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';
import { CsvImportMapping } from './csv-import-mapping';
import { CsvImportPreview } from './csv-import-preview';

type Loaded = { name: string; bytes: Uint8Array; table: Table; mapping: Mapping; ourLayout: boolean };

function readBytes(file: File): Promise<Uint8Array> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(new Uint8Array(reader.result as ArrayBuffer));
    reader.onerror = () => reject(reader.error ?? new Error('The file could not be read.'));
    reader.readAsArrayBuffer(file);
  });
}

const plural = (n: number, what: string) => `${n} ${what}${n === 1 ? '' : 's'}`;

/**
 * Readings of one measurement set taken from a CSV file, read in the browser only. Nothing is saved
 * here: "Use these readings" fills the form, which the analyst reviews and submits as always.
 */
export function CsvImport({ target, onUse }: { target: ImportTarget; onUse: (values: ImportedValues, meta: ImportMeta) => void }) {
  const id = useId();
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [used, setUsed] = useState<string | null>(null);
  const [showMapping, setShowMapping] = useState(false);
  const [expanded, setExpanded] = useState(false);

  // A mapping that cannot work (no freezing-point column, a column feeding two fields) is said at its selects, not as errors on every row.
  const mappingProblems = loaded ? (mappingSchema.safeParse(loaded.mapping).error?.issues.map((i) => i.message) ?? []) : [];
  const result = useMemo(() => (loaded && mappingSchema.safeParse(loaded.mapping).success ? validateImport(loaded.table, loaded.mapping, target) : null), [loaded, target]);

  const open = (name: string, bytes: Uint8Array, delimiter?: Delimiter) => {
    const opened = openReadingsFile(bytes, delimiter);
    setUsed(null);
    if (!opened.ok) {
      setLoaded(null);
      setFileError(`${name}: ${opened.message}`);
      return;
    }
    setFileError(null);
    setLoaded({ name, bytes, table: opened.table, mapping: opened.mapping, ourLayout: opened.ourLayout });
    setShowMapping(!opened.ourLayout);
  };

  const onFile = async (event: React.ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    event.target.value = '';
    if (!file) return;
    try {
      open(file.name, await readBytes(file));
    } catch {
      setLoaded(null);
      setFileError(`${file.name}: the browser could not read the file. Choose it again.`);
    }
  };

  const changeMapping = (mapping: Mapping) => {
    if (!loaded) return;
    setUsed(null);
    if (mapping.delimiter !== loaded.mapping.delimiter) open(loaded.name, loaded.bytes, mapping.delimiter);
    else setLoaded({ ...loaded, mapping });
  };

  const use = () => {
    if (!result?.values) return;
    onUse(result.values, result.meta);
    const cal = result.values.calibrationReadings.length;
    setUsed(`${plural(result.values.readings.length, 'reading')} of the sample${cal ? ` and ${plural(cal, 'calibration reading')}` : ''} from ${loaded?.name} are in the form. Review them, complete the rest and submit.`);
    setLoaded(null);
  };

  return (
    <details className="mb-4 rounded-control border border-line bg-paper-deep/40 p-3" open={expanded} onToggle={(e) => setExpanded(e.currentTarget.open)}>
      <summary className="cursor-pointer font-bold">Import readings from a CSV file</summary>
      <div className="mt-3 grid gap-3 text-sm">
        <p>
          One file holds one measurement set: a header row, then one row per reading. See <Link href="/about/readings-csv">the CSV layout</Link> or download{' '}
          <a href="/templates/readings-template.csv" download>
            the template
          </a>
          . The file is read in your browser; nothing is saved until you submit the form.
        </p>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-file`} className="font-bold">
            CSV file of readings
          </label>
          <input id={`${id}-file`} data-testid="csv-file" type="file" accept=".csv,text/csv,text/plain" onChange={onFile} className="text-sm" />
        </div>
        {fileError ? <FormMessage tone="error">{fileError}</FormMessage> : null}
        {used ? <FormMessage tone="success">{used}</FormMessage> : null}
        {loaded ? (
          <>
            <p className="text-brine">
              {loaded.name}: {plural(loaded.table.rows.length, 'row')}, {loaded.table.delimiter === ';' ? 'semicolon' : 'comma'}-separated, decimal {loaded.mapping.decimal === ',' ? 'comma' : 'point'}
              {loaded.ourLayout ? ', in our layout' : ', in another layout'}.{' '}
              {loaded.ourLayout ? (
                <button type="button" className="font-bold text-frost-dark underline" onClick={() => setShowMapping((v) => !v)} aria-expanded={showMapping}>
                  {showMapping ? 'Hide the column mapping' : 'Change the column mapping'}
                </button>
              ) : null}
            </p>
            {showMapping ? <CsvImportMapping header={loaded.table.header} mapping={loaded.mapping} onChange={changeMapping} allowHortvet={target.hortvetConversion !== null} /> : null}
            {!showMapping && loaded.mapping.columns.unit === null ? (
              <CsvImportMapping header={loaded.table.header} mapping={loaded.mapping} onChange={changeMapping} allowHortvet={target.hortvetConversion !== null} unitOnly />
            ) : null}
            {result ? <CsvImportPreview result={result} /> : <FormMessage tone="error">Complete the column mapping: {mappingProblems.join(' ')}</FormMessage>}
            <div className="flex flex-wrap items-center gap-3">
              <Button type="button" onClick={use} disabled={!result?.values}>
                Use these readings
              </Button>
              {result?.values ? (
                <span className="text-brine">
                  {result.meta.notes > 0 ? 'Notes are shown here only: the form keeps none per reading; add one to the case if it matters. ' : ''}
                  {result.meta.convertedFromHortvet ? 'Values in °H were converted with the scheme’s conversion and rounded to 0.0001 °C. ' : ''}
                </span>
              ) : (
                <span className="text-rust font-bold">Correct the file and choose it again, or change the mapping: a set is taken whole or not at all.</span>
              )}
              <Button
                type="button"
                variant="quiet"
                onClick={() => {
                  setLoaded(null);
                  setFileError(null);
                }}
              >
                Discard
              </Button>
            </div>
          </>
        ) : null}
      </div>
    </details>
  );
}
