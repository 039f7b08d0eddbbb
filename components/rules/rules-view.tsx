import type { RulesVersion } from '@/lib/dal/rules';
import { Card, DefinitionList, EmptyState } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { formatCelsius, toTenthMilliC, formatMilliC } from '@/lib/temperature';
import { formatDateTime } from '@/lib/format/dates';

const ruleLabels = { simple: 'Simple acceptance (shared risk)', guarded_rejection: 'Guarded rejection (benefit of the doubt to the supplier)', guarded_acceptance: 'Guarded acceptance (benefit of the doubt to the buyer)' };
const disagreementLabels = { third_laboratory: 'A third laboratory tests a further sample', referee_decides: 'The referee laboratory’s result stands' };
const feeLabels = { losing_party: 'The party that loses', plant: 'The plant', supplier: 'The supplier' };

export function RulesView({ current, versions }: { current: RulesVersion | null; versions: RulesVersion[] }) {
  if (!current) return <EmptyState title="No rules are in force">An administrator must publish the scheme’s rules before intake results can be recorded.</EmptyState>;
  const r = current.rules;
  const c = (v: number) => formatCelsius(toTenthMilliC(v));
  return (
    <div className="grid gap-6">
      <Card title={`${r.name} · version ${current.version}`} actions={<Badge tone="success">In force since {formatDateTime(current.effectiveFrom)}</Badge>}>
        <div className="grid gap-6 md:grid-cols-2">
          <DefinitionList
            items={[
              { term: 'Upper limit', detail: <span className="num">{c(r.limits.upper)}</span> },
              { term: 'Lower limit', detail: r.limits.lower === undefined ? 'none' : <span className="num">{c(r.limits.lower)}</span> },
              { term: 'Repeatability r', detail: <span className="num">{formatMilliC(toTenthMilliC(r.precision.r))}</span> },
              { term: 'Reproducibility R', detail: <span className="num">{formatMilliC(toTenthMilliC(r.precision.R))}</span> },
              { term: 'Decision rule', detail: ruleLabels[r.decisionRule] },
              { term: 'If laboratories disagree', detail: disagreementLabels[r.onDisagreement] },
              { term: 'Authentic reference', detail: <span className="num">{c(r.referenceFreezingPoint)}</span> },
            ]}
          />
          <DefinitionList
            items={[
              { term: 'Calibration check', detail: `${r.calibration.required} of ${r.calibration.readings} readings within ±${formatMilliC(toTenthMilliC(r.calibration.tolerance))} of ${c(r.calibration.nominal)}, valid ${r.calibration.validHours} h` },
              { term: 'Unfit instrument', detail: r.calibration.allowUnfitWithWarning ? 'results recorded with a warning' : 'intake tests refused' },
              { term: 'Sample validity', detail: `${r.sample.validHours} h after sampling, stored ${r.sample.storageRange.min}–${r.sample.storageRange.max} °C` },
              { term: 'Contest window', detail: `${r.deadlines.contestHours} h after notice` },
              { term: 'Dispatch of the sample', detail: `within ${r.deadlines.dispatchHours} h of the dispute` },
              { term: 'Decision', detail: `within ${r.deadlines.decisionWorkingDays} working days of the retest` },
              { term: 'Milk price', detail: `${r.money.milkPricePerLitre} ${r.currency} per litre` },
              { term: 'Deduction', detail: `added-water share of the volume; rejection from ${r.rejectionAddedWaterPercent} % added water` },
              { term: 'Referee fee', detail: `${r.money.refereeFee} ${r.currency}, borne by: ${feeLabels[r.money.feeBorneBy].toLowerCase()}` },
            ]}
          />
        </div>
      </Card>
      <Card title="Versions">
        <ol className="grid gap-1 text-sm">
          {versions.map((v) => (
            <li key={v.id} className="flex flex-wrap items-center gap-3">
              <span className="font-bold num">v{v.version}</span>
              <span className="num">from {formatDateTime(v.effectiveFrom)}</span>
              {v.id === current.id ? (
                <Badge tone="success">In force</Badge>
              ) : v.effectiveFrom.getTime() > current.effectiveFrom.getTime() ? (
                <Badge tone="action">Scheduled</Badge>
              ) : (
                <Badge tone="neutral">Earlier</Badge>
              )}
              <span className="text-brine">{v.note}</span>
            </li>
          ))}
        </ol>
        <p className="mt-3 text-xs text-brine">Every intake result, calibration check and case keeps the version it was made under; a new version applies only to what is made after it takes effect.</p>
      </Card>
    </div>
  );
}
