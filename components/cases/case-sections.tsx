import type { CaseFile } from '@/lib/dal/case-file';
import { formatCelsius, formatStorageCelsius } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDateTime } from '@/lib/format/dates';
import { Card, DefinitionList, EmptyState } from '@/components/ui/card';
import { Badge, VerdictBadge } from '@/components/ui/status';

const groundLabels: Record<string, string> = {
  sampling: 'Sampling',
  instrument: 'Instrument',
  natural_variation: 'Natural variation of the herd',
  sample_handling: 'Sample handling',
  other: 'Other',
};
const custodyLabels: Record<string, string> = {
  sealed: 'Sealed',
  stored: 'Stored',
  dispatched: 'Dispatched',
  received: 'Received',
  seal_checked: 'Seal checked',
  opened: 'Opened',
  disposed: 'Disposed',
};
const purposeLabels: Record<string, string> = { intake: 'Intake (plant laboratory)', retest: 'Retest (referee laboratory)', further_test: 'Further test' };
const basisLabels: Record<string, string> = { mean_of_2: 'mean of 2 readings', mean_of_4: 'mean of 4 readings', median_of_4: 'median of 4 readings' };

export function ContestedResult({ file }: { file: CaseFile }) {
  return (
    <Card id="contested" title="Contested result">
      <div className="grid gap-6 md:grid-cols-2">
        <DefinitionList
          items={[
            { term: 'Delivery', detail: <span className="num">{file.delivery?.reference}</span> },
            { term: 'Farm', detail: `${file.delivery?.farmName} (${file.delivery?.herdCode})` },
            { term: 'Collected', detail: file.delivery ? formatDateTime(file.delivery.collectedAt) : '—' },
            { term: 'Volume', detail: <span className="num">{file.delivery?.volumeLitres.toLocaleString('en-GB')} l</span> },
            { term: 'Tanker', detail: `${file.delivery?.tanker}, compartment ${file.delivery?.compartment}` },
          ]}
        />
        {file.intake ? (
          <DefinitionList
            items={[
              { term: 'Result', detail: <VerdictBadge verdict={file.intake.verdict} /> },
              { term: 'Freezing point', detail: <span className="num">{formatCelsius(file.intake.valueTenthMilliC)}</span> },
              { term: 'Limit', detail: <span className="num">{formatCelsius(file.intake.limitTenthMilliC)} · {file.intake.decisionRule.replaceAll('_', ' ')}</span> },
              { term: 'Added water', detail: <span className="num">{(file.intake.addedWaterBasisPoints / 100).toFixed(2)} %</span> },
              { term: 'Withheld', detail: <span className="num">{formatMoney(file.intake.amountMinor, file.intake.currency)}</span> },
              { term: 'Rules', detail: file.rules ? `${file.rules.name}, v${file.rules.version}` : '—' },
            ]}
          />
        ) : (
          <EmptyState title="Withheld from the referee laboratory until its retest is submitted">The retest is blind, so the intake value does not steer it.</EmptyState>
        )}
      </div>
      <div className="mt-5 border-t border-line pt-4">
        <h3 className="mb-2 font-bold">The supplier’s grounds</h3>
        <div className="mb-2 flex flex-wrap gap-2">
          {file.grounds.map((g) => (
            <Badge key={g} tone="neutral">
              {groundLabels[g] ?? g}
            </Badge>
          ))}
        </div>
        {file.explanation ? <p className="whitespace-pre-line text-ink-soft">{file.explanation}</p> : <p className="text-sm text-brine">The supplier’s explanation is shown after the retest.</p>}
        {file.remedy ? (
          <p className="mt-2 text-sm">
            <span className="font-bold">Remedy asked: </span>
            {file.remedy}
          </p>
        ) : null}
      </div>
    </Card>
  );
}

export function Readings({ file }: { file: CaseFile }) {
  return (
    <Card id="readings" title="Readings">
      {file.measurementSets.length === 0 ? (
        <EmptyState title="No readings yet">{file.blind ? 'Your retest readings appear here once entered.' : 'The retest readings appear here when the referee laboratory submits them.'}</EmptyState>
      ) : (
        <div className="grid gap-4 md:grid-cols-2">
          {file.measurementSets.map((set) => (
            <div key={set.id} className="rounded-card border border-line bg-white p-4">
              <h3 className="font-bold">{purposeLabels[set.purpose] ?? set.purpose}</h3>
              <p className="text-xs text-brine">
                {set.laboratory} · instrument {set.instrumentSerial} · {set.analystName} · {formatDateTime(set.testedAt)}
              </p>
              {set.calibrationWarning ? (
                <p role="note" className="mt-2 rounded-control border border-amber bg-amber-soft px-2 py-1 text-xs font-bold text-amber">
                  ▲ Recorded without a passing calibration check in force: {set.calibrationWarning}
                </p>
              ) : null}
              <ol className="mt-3 grid grid-cols-2 gap-1 text-sm num">
                {set.readings.map((r) => (
                  <li key={r.position}>
                    {r.position}. {formatCelsius(r.valueTenthMilliC, 4)}
                    {r.flag !== 'none' ? <span className="ml-1 text-xs text-amber">▲ {r.flag.replaceAll('_', ' ')}</span> : null}
                  </li>
                ))}
              </ol>
              <p className="mt-3 text-sm">
                <span className="font-bold">Final result: </span>
                {set.resultTenthMilliC === null ? 'not yet' : <span className="num">{formatCelsius(set.resultTenthMilliC, 4)}</span>}
                {set.resultBasis ? <span className="text-brine"> ({basisLabels[set.resultBasis]})</span> : null}
              </p>
            </div>
          ))}
        </div>
      )}
    </Card>
  );
}

export function SamplesAndCustody({ file }: { file: CaseFile }) {
  return (
    <Card id="custody" title="Samples and custody">
      {file.samples.length === 0 ? (
        <EmptyState title="No retained sample is recorded for this delivery" />
      ) : (
        <div className="grid gap-5">
          {file.samples.map((s) => (
            <div key={s.id}>
              <h3 className="font-bold">
                <span className="num">{s.code}</span> <span className="text-sm font-normal text-brine">· {s.kind} sample · seal {s.sealNumber ?? 'none'} · preservative {s.preservative ?? 'none'}</span>
              </h3>
              {s.custody.length === 0 ? (
                <p className="text-sm text-brine">No custody event yet.</p>
              ) : (
                <ol className="mt-2 border-l-2 border-line pl-4">
                  {s.custody.map((c) => (
                    <li key={c.id} className="relative mb-3">
                      <span aria-hidden="true" className="absolute -left-[1.4rem] top-1.5 h-2.5 w-2.5 rounded-full border-2 border-frost bg-paper" />
                      <p className="text-sm">
                        <span className="font-bold">{custodyLabels[c.kind] ?? c.kind}</span> · {formatDateTime(c.at)} · {c.organisation}
                      </p>
                      <p className="text-xs text-brine">
                        {[c.location, c.tempTenthMilliC !== null ? formatStorageCelsius(c.tempTenthMilliC) : null, c.sealIntact === null ? null : c.sealIntact ? 'seal intact' : 'SEAL BROKEN', c.frozen ? 'FROZEN' : null]
                          .filter(Boolean)
                          .join(' · ')}
                      </p>
                      {c.note ? <p className="text-xs text-ink-soft">{c.note}</p> : null}
                    </li>
                  ))}
                </ol>
              )}
            </div>
          ))}
        </div>
      )}
    </Card>
  );
}
