import type { Assessment, AssessmentInput } from '@/lib/arbitration';
import { Card } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { ReadingsChart } from './readings-chart';

const outcomeLabels: Record<Assessment['outcome'], string> = {
  uphold: 'Uphold the intake result',
  reverse: 'Reverse the intake result',
  adjust: 'Adjust the intake result',
  further_test: 'Order a further test',
  incomplete: 'Not yet possible: information is missing',
};
const statusTone = { pass: 'success', fail: 'failure', not_applicable: 'neutral', missing: 'warning' } as const;
const statusWord = { pass: 'Pass', fail: 'Fail', not_applicable: 'Not applicable', missing: 'Missing' } as const;

const c = (v: number) => `${v.toFixed(4).replace('-', '−')} °C`;
const mc = (v: number) => `${(v * 1000).toFixed(2).replace('-', '−')} m°C`;

function resultText(result: Assessment['original'] | null): string {
  if (!result) return 'no retest yet';
  return result.status === 'accepted' ? `${c(result.value)} (${result.basis.replaceAll('_', ' ')})` : `${result.needed} more reading(s) needed`;
}

/** The board's side-by-side: both laboratories, the chart, and the decision module's proposal with every check. */
export function ReviewPanel({ assessment, input, showProposal }: { assessment: Assessment; input: AssessmentInput; showProposal: boolean }) {
  const upper = assessment.conformity?.upper ?? null;
  return (
    <Card id="review" title="Review: both laboratories side by side">
      <div className="grid gap-4 md:grid-cols-3">
        <div className="rounded-card border border-line bg-white p-3">
          <p className="text-xs font-bold uppercase text-brine">Plant laboratory (intake)</p>
          <p className="text-lg font-bold num">{resultText(assessment.original)}</p>
          <p className="text-xs text-brine">{assessment.originalCounts ? 'counts towards the accepted value' : 'does not count (see checks)'}</p>
        </div>
        <div className="rounded-card border border-line bg-white p-3">
          <p className="text-xs font-bold uppercase text-brine">Referee laboratory (retest)</p>
          <p className="text-lg font-bold num">{resultText(assessment.retest)}</p>
        </div>
        <div className="rounded-card border border-line bg-white p-3">
          <p className="text-xs font-bold uppercase text-brine">Comparison</p>
          {assessment.comparison ? (
            <p className="text-sm">
              difference <span className="num">{mc(Math.abs(assessment.comparison.difference))}</span> vs critical difference <span className="num">{mc(assessment.comparison.criticalDifference)}</span> —{' '}
              <strong>{assessment.comparison.agree ? 'they agree' : 'they disagree'}</strong>
            </p>
          ) : (
            <p className="text-brine">not compared</p>
          )}
          {assessment.acceptedValue !== null ? <p className="num">accepted value {c(assessment.acceptedValue)}</p> : null}
        </div>
      </div>
      <figure className="mt-4">
        <ReadingsChart
          sets={[
            { label: 'Plant laboratory', readings: input.original.readings, result: assessment.original.status === 'accepted' ? assessment.original.value : null },
            ...(input.retest ? [{ label: 'Referee laboratory', readings: input.retest.readings, result: assessment.retest?.status === 'accepted' ? assessment.retest.value : null }] : []),
          ]}
          r={input.rules.precision.r}
          criticalDifference={assessment.comparison?.criticalDifference ?? null}
          limit={input.rules.limits.upper}
          acceptanceLimit={upper?.acceptanceLimit ?? null}
        />
        <figcaption className="text-xs text-brine">
          Dashed boxes: each result ± r/2 (repeatability). Shaded: the critical difference around the mean of both results; both results inside it means the laboratories agree. Red: the limit, and the acceptance limit after the guard band. Warmer (less negative) is up. Point at a mark, box or line for its value.
        </figcaption>
      </figure>
      {showProposal ? (
        <div className="mt-6 border-t border-line pt-4">
          <h3 className="mb-1 text-lg font-bold">Proposal</h3>
          <p className="mb-2 flex flex-wrap items-center gap-2">
            <Badge tone={assessment.outcome === 'incomplete' ? 'warning' : 'action'}>{outcomeLabels[assessment.outcome]}</Badge>
            {assessment.addedWater ? <span className="text-sm num">added water {assessment.addedWater.indicated ? `${assessment.addedWater.percent.toFixed(2)} %` : 'not indicated'}</span> : null}
          </p>
          <p className="mb-3 text-ink-soft">{assessment.summary}</p>
          <table className="w-full text-sm">
            <thead>
              <tr className="border-b border-line text-left text-brine">
                <th scope="col" className="py-2 pr-3">Check</th>
                <th scope="col" className="py-2 pr-3">What was found</th>
                <th scope="col" className="py-2">Rule and source</th>
              </tr>
            </thead>
            <tbody>
              {assessment.checks.map((check) => (
                <tr key={check.id} className="border-b border-line/60 align-top">
                  <td className="py-2 pr-3">
                    <Badge tone={statusTone[check.status]}>{statusWord[check.status]}</Badge>
                  </td>
                  <td className="py-2 pr-3">{check.detail}</td>
                  <td className="py-2 text-xs text-brine">{check.source}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-3 text-xs text-brine">The proposal supports the arbiter, who decides. Local regulations and the supply contract prevail.</p>
        </div>
      ) : null}
    </Card>
  );
}
