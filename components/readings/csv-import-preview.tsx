'use client';

import { fieldLabels, previewCelsius, type ImportResult } from '@/lib/readings-import';

const kindLabel = { sample: 'Sample', calibration: 'Calibration' } as const;
const flagLabel = { none: 'Normal', early_crystallisation: 'Early crystallisation', no_crystallisation: 'No crystallisation' } as const;
const fieldName = (field: string) => (field === 'set' ? 'Set' : fieldLabels[field as keyof typeof fieldLabels]);

/** The file's rows as they will be used, each with its problems written beside it. */
export function CsvImportPreview({ result }: { result: ImportResult }) {
  const setErrors = result.errors.filter((e) => e.line === null);
  const badRows = result.rows.filter((r) => r.errors.length > 0).length;
  const time = (d: Date | null) => (d ? d.toLocaleString('en-GB', { dateStyle: 'short', timeStyle: 'short' }) : '');

  return (
    <div className="grid gap-2">
      {result.errors.length > 0 ? (
        <div role="alert" className="rounded-control border border-rust bg-rust-soft px-3 py-2 font-bold text-rust">
          <p>
            ✕ The file cannot be used as it is{badRows > 0 ? `: ${badRows} row${badRows === 1 ? ' has a problem' : 's have problems'}, shown beside ${badRows === 1 ? 'it' : 'them'}` : ''}.
          </p>
          {setErrors.length ? (
            <ul className="mt-1 list-disc pl-5 font-normal">
              {setErrors.map((e, i) => (
                <li key={i}>{e.message}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : (
        <p role="status" className="font-bold text-clover">
          ✓ Every row can be used.
        </p>
      )}
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left" data-testid="csv-preview">
          <caption className="sr-only">Rows of the file as they will be imported</caption>
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="p-2">Line</th>
              <th scope="col" className="p-2">Kind</th>
              <th scope="col" className="p-2">Replicate</th>
              <th scope="col" className="p-2">In the file</th>
              <th scope="col" className="p-2">Freezing point</th>
              <th scope="col" className="p-2">Observation</th>
              <th scope="col" className="p-2">Measured at</th>
              <th scope="col" className="p-2">Sample</th>
              <th scope="col" className="p-2">Note</th>
              <th scope="col" className="p-2">Problems</th>
            </tr>
          </thead>
          <tbody>
            {result.rows.map((row) => {
              const bad = row.errors.length > 0;
              return (
                <tr key={row.line} className={`border-b border-line align-top ${bad ? 'bg-rust-soft' : ''}`} data-line={row.line} aria-invalid={bad || undefined}>
                  <th scope="row" className="p-2 num">
                    {row.line}
                  </th>
                  <td className="p-2">{row.kind ? kindLabel[row.kind] : ''}</td>
                  <td className="p-2 num">{row.replicate ?? ''}</td>
                  <td className="p-2 num">{row.source}</td>
                  <td className="p-2 num font-bold">{previewCelsius(row.tenthMilliC)}</td>
                  <td className="p-2">{row.kind === 'sample' ? flagLabel[row.flag] : ''}</td>
                  <td className="p-2 num">{time(row.measuredAt)}</td>
                  <td className="p-2">{row.sampleCode}</td>
                  <td className="p-2">{row.note}</td>
                  <td className="p-2">
                    {bad ? (
                      <ul className="grid gap-1 font-bold text-rust">
                        {row.errors.map((e, i) => (
                          <li key={i}>
                            ✕ Line {row.line}, {fieldName(e.field).toLowerCase()}: {e.message}
                          </li>
                        ))}
                      </ul>
                    ) : (
                      <span className="text-clover">✓ OK</span>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
