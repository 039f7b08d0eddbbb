import Link from 'next/link';
import type { DeliveryRecord } from '@/lib/dal/intake-record';
import { decisionRuleLabels, flagGuidance, flagLabels, preparationLabels, resultBasisLabels, sampleTemperatureCheck } from '@/lib/intake/practice';
import { formatCelsius, formatStorageCelsius, fromTenthMilliC } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDateTime } from '@/lib/format/dates';
import { Card, DefinitionList } from '@/components/ui/card';
import { Badge, VerdictBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';

type Result = DeliveryRecord['results'][number];

const c4 = (v: number) => `${v.toFixed(4).replace('-', '−')} °C`;

/** One intake result with everything it rests on: readings, instrument check, rules version, money and notice. */
export function IntakeResultDetails({ result, showInstrumentLink }: { result: Result; showInstrumentLink: boolean }) {
  const temp = result.sampleTempTenthMilliC === null ? null : sampleTemperatureCheck(fromTenthMilliC(result.sampleTempTenthMilliC));
  const flags = [...new Set(result.readings.map((r) => r.flag).filter((f) => f !== 'none'))] as Exclude<Result['readings'][number]['flag'], 'none'>[];
  const ruleName = decisionRuleLabels[result.decisionRule as keyof typeof decisionRuleLabels] ?? result.decisionRule;
  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <VerdictBadge verdict={result.verdict} />
        <span className="text-lg font-bold num">{formatCelsius(result.valueTenthMilliC)}</span>
        <span className="text-sm text-brine">
          {result.resultBasis ? resultBasisLabels[result.resultBasis] : ''} · rules v{result.rulesVersion} ({result.rules.name})
        </span>
      </div>
      {result.calibrationWarning ? (
        <p role="alert" className="rounded-control border border-amber bg-amber-soft px-3 py-2 text-sm font-bold text-amber">
          ▲ {result.calibrationWarning} The supplier and the board see this warning.
        </p>
      ) : null}
      <div className="grid gap-6 md:grid-cols-2">
        <DefinitionList
          items={[
            {
              term: 'Rule applied',
              detail: (
                <span>
                  {result.limitApplied === 'lower' ? 'Lower' : 'Upper'} limit <span className="num">{formatCelsius(result.limitTenthMilliC)}</span>, {ruleName}; acceptance limit{' '}
                  <span className="num">{c4(result.acceptanceLimit)}</span>
                </span>
              ),
            },
            { term: 'Added water', detail: <span className="num">{(result.addedWaterBasisPoints / 100).toFixed(2)} % against {formatCelsius(Math.round(result.rules.referenceFreezingPoint * 10_000))}</span> },
            { term: 'Withheld', detail: result.verdict === 'accepted' ? 'nothing' : <span className="num">{formatMoney(result.amountMinor, result.currency)} ({result.arithmetic})</span> },
            { term: 'Rules', detail: <span>version {result.rulesVersion}, in force from {formatDateTime(result.rulesEffectiveFrom)}</span> },
            { term: 'Decided', detail: `${formatDateTime(result.decidedAt)}${result.decidedByName ? ` by ${result.decidedByName}` : ''}` },
            { term: 'Supplier told', detail: result.notifiedAt ? formatDateTime(result.notifiedAt) : result.verdict === 'accepted' ? 'not needed (accepted)' : 'not yet' },
          ]}
        />
        <DefinitionList
          items={[
            {
              term: 'Instrument',
              detail: showInstrumentLink ? <Link href={`/instruments/${result.instrumentId}`}>{result.instrumentSerial}</Link> : <span>{result.instrumentSerial}</span>,
            },
            {
              term: 'Calibration check',
              detail: result.checkId ? (
                <span>
                  {result.checkPass ? <Badge tone="success">Passed</Badge> : <Badge tone="failure">Failed</Badge>} {formatDateTime(result.checkedAt!)} on {formatCelsius(result.checkNominalTenthMilliC!)}, {result.checkWithin} of{' '}
                  {result.checkTotal} within tolerance; valid until {formatDateTime(result.checkValidUntil!)}
                </span>
              ) : (
                'none recorded'
              ),
            },
            { term: 'Tested', detail: `${formatDateTime(result.testedAt)} by ${result.analystName}` },
            {
              term: 'Test portion',
              detail: temp ? (
                <span>
                  <span className="num">{formatStorageCelsius(result.sampleTempTenthMilliC!)}</span> {temp.ok ? null : <Badge tone="warning">Flagged: outside 20 ± 2 °C</Badge>}
                </span>
              ) : (
                'not recorded'
              ),
            },
            { term: 'Preparation', detail: preparationLabels[result.preparation] },
          ]}
        />
      </div>
      <div>
        <h3 className="mb-1 text-sm font-bold text-brine">Readings, in the order taken</h3>
        <ol className="flex flex-wrap gap-2">
          {result.readings.map((r) => (
            <li key={r.position} className={`rounded-control border px-2 py-1 text-sm num ${result.readingsUsed !== null && r.position > result.readingsUsed ? 'border-dashed border-line text-brine' : 'border-line bg-white'}`}>
              {r.position}. {formatCelsius(r.valueTenthMilliC, 4)}
              {r.flag !== 'none' ? <span className="ml-1 text-xs text-amber">▲ {flagLabels[r.flag]}</span> : null}
            </li>
          ))}
        </ol>
        {flags.map((f) => (
          <p key={f} className="mt-1 text-xs text-amber">
            ▲ {flagGuidance[f]}
          </p>
        ))}
      </div>
      {result.verdict !== 'accepted' && !result.supersededAt ? (
        result.dispute ? (
          <p className="text-sm">
            Disputed in <Link href={`/cases/${result.dispute.id}`}>{result.dispute.number}</Link>.
          </p>
        ) : result.contestDeadline ? (
          <Deadline label={result.contestOpen ? 'Contest by' : 'Contest window closed'} due={result.contestDeadline} />
        ) : null
      ) : null}
    </div>
  );
}

/** The earlier results a correction replaced, each with who corrected it, when and why. */
export function CorrectionHistory({ record }: { record: DeliveryRecord }) {
  const earlier = record.results.filter((r) => r.supersededAt);
  if (earlier.length === 0) return null;
  const by = (id: string) => record.results.find((r) => r.supersedesId === id);
  return (
    <Card id="history" title="Earlier results, kept as recorded">
      <ol className="grid gap-6">
        {earlier.map((r) => {
          const next = by(r.id);
          return (
            <li key={r.id} className="rounded-card border border-dashed border-line p-4">
              <p className="mb-2 text-sm font-bold text-brine">
                Superseded {formatDateTime(r.supersededAt!)}
                {next ? ` by ${next.decidedByName ?? 'the plant'}: “${next.correctionReason}”` : ''}
              </p>
              <IntakeResultDetails result={r} showInstrumentLink={false} />
            </li>
          );
        })}
      </ol>
    </Card>
  );
}
