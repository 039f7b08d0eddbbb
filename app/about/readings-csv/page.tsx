import type { Metadata } from 'next';
import Link from 'next/link';
import { MAX_DATA_ROWS, MAX_FILE_BYTES, SAMPLE_READINGS } from '@/lib/readings-import/layout';

export const metadata: Metadata = { title: 'Readings CSV layout' };

const columns: { name: string; required: string; what: string }[] = [
  { name: 'freezing_point', required: 'yes', what: 'The reading, in the unit of the row’s unit column or the unit you choose on import. A freezing point of milk lies between −1.000 and 0.000 °C: write the minus sign. At most four decimals in °C, one in m°C.' },
  { name: 'replicate', required: 'recommended', what: 'The reading’s number, 1, 2, 3… in the order taken, separately for sample and calibration rows. Each number once, none left out. Without the column, the rows’ order is the order taken.' },
  { name: 'unit', required: 'no', what: 'm°C, °C or °H (also written mC, C, H). Without the column, a unit in brackets after the column name counts, such as freezing_point [m°C]; otherwise the unit you choose. °H is converted to °C with the conversion your scheme uses and rounded to 0.0001 °C.' },
  { name: 'kind', required: 'no', what: 'sample (the default) or calibration. Calibration rows are the readings on the reference standard of the referee laboratory’s calibration check; their number must be the scheme’s. The intake form takes none: it relies on the instrument’s check in force.' },
  { name: 'observation', required: 'no', what: 'normal (the default), early_crystallisation or no_crystallisation, for readings of the sample.' },
  { name: 'measured_at', required: 'no', what: 'ISO 8601, such as 2026-03-14T07:42:00+01:00. Without an offset, your browser’s local time. The earliest reading of the sample fills “Tested at”.' },
  { name: 'sample_code', required: 'no', what: 'The code of the sample tested. One file holds one sample; at the referee bench it must be the case’s retained sample.' },
  { name: 'instrument', required: 'no', what: 'The instrument’s serial number. It chooses the instrument in the form when it is one of yours; one file, one instrument.' },
  { name: 'analyst', required: 'no', what: 'Who took the readings; fills “Analyst”.' },
  { name: 'note', required: 'no', what: 'Shown in the preview only: the readings keep no note. Add a note to the case if it matters.' },
];

function Code({ children }: { children: React.ReactNode }) {
  return <code className="rounded bg-paper-deep px-1 font-mono text-sm">{children}</code>;
}

export default function ReadingsCsvPage() {
  return (
    <main id="main" className="mx-auto max-w-3xl px-4 py-10">
      <p className="text-sm font-bold uppercase tracking-wide text-brine">Countersample</p>
      <h1 className="mb-6 text-3xl font-bold">Readings CSV layout</h1>
      <div className="grid gap-6 leading-relaxed">
        <p>
          The intake form and the referee laboratory’s bench form can take the readings of one measurement set from a CSV file. The file is read in your browser and
          shown row by row with any problem beside its row; “Use these readings” puts them into the form, where you review them and submit as usual. Nothing is saved
          by the import itself, and a file with any problem is not taken at all.
        </p>
        <section>
          <h2 className="mb-2 text-xl font-bold">The file</h2>
          <ul className="list-disc pl-6">
            <li>Plain text in UTF-8, with or without a byte-order mark; at most {MAX_FILE_BYTES / 1024} kB and {MAX_DATA_ROWS} rows.</li>
            <li>The first line names the columns; names may be in any order and any case. Blank lines are ignored.</li>
            <li>
              Columns separated by commas (<Code>,</Code>) or semicolons (<Code>;</Code>), judged from the header line.
            </li>
            <li>
              A decimal point (<Code>-0.5124</Code>) or a decimal comma (<Code>-0,5124</Code>), never both, and no thousands separators. A decimal comma in a
              comma-separated file must be quoted (<Code>&quot;-0,5124&quot;</Code>); semicolon-separated files, common where the comma is the decimal separator, need no quotes.
            </li>
            <li>
              One sample per file, {SAMPLE_READINGS.min} to {SAMPLE_READINGS.max} readings of it. The decision module then says, as when typing, whether the readings give a result or more are needed.
            </li>
          </ul>
        </section>
        <section>
          <h2 className="mb-2 text-xl font-bold">Columns</h2>
          <table className="w-full border-collapse text-left text-sm">
            <thead>
              <tr className="border-b border-line">
                <th scope="col" className="p-2">Column</th>
                <th scope="col" className="p-2">Needed</th>
                <th scope="col" className="p-2">What it holds</th>
              </tr>
            </thead>
            <tbody>
              {columns.map((c) => (
                <tr key={c.name} className="border-b border-line align-top">
                  <th scope="row" className="p-2">
                    <Code>{c.name}</Code>
                  </th>
                  <td className="p-2">{c.required}</td>
                  <td className="p-2">{c.what}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
        <section>
          <h2 className="mb-2 text-xl font-bold">Example</h2>
          <pre className="overflow-x-auto rounded-card border border-line bg-white p-3 text-sm">
            {`kind;replicate;freezing_point;unit;measured_at;sample_code
calibration;1;-512,1;m°C;2026-03-14T07:30:00+01:00;NaCl-0512
…
sample;1;-0,5062;°C;2026-03-14T07:45:00+01:00;K-LW-20260314-UL-104
sample;2;-0,5068;°C;2026-03-14T07:48:00+01:00;K-LW-20260314-UL-104`}
          </pre>
          <p className="mt-2">
            <a href="/templates/readings-template.csv" download>
              Download the template
            </a>{' '}
            (invented values, comma-separated).
          </p>
        </section>
        <section>
          <h2 className="mb-2 text-xl font-bold">Other layouts</h2>
          <p>
            A file whose header is not this layout gets a mapping step: for each field you choose the column that holds it, and the unit and separators, with the
            preview following each change. Instrument software’s own file formats are not read: export the readings as CSV first.
          </p>
        </section>
        <p className="text-sm text-brine">
          <Link href="/about/method">About the method</Link> · <Link href="/desk">Your desk</Link>
        </p>
      </div>
    </main>
  );
}
