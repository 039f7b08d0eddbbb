import type { SealedDecisionView } from '@/lib/dal/decision-view';
import { decisionOutcomeLabels } from '@/lib/decision/labels';
import { formatDateTime } from '@/lib/format/dates';
import { DefinitionList } from '@/components/ui/card';
import { buttonClass } from '@/components/ui/button';
import { Badge } from '@/components/ui/status';

function Seal({ decision }: { decision: SealedDecisionView }) {
  if (!decision.recordSha256) return <p className="text-sm text-rust">This decision carries no seal.</p>;
  return (
    <dl className="grid gap-1 text-xs">
      <div>
        <dt className="font-bold text-brine">Record SHA-256</dt>
        <dd className="break-all font-mono" data-testid="record-sha256">
          {decision.recordSha256}
        </dd>
      </div>
      <div>
        <dt className="font-bold text-brine">Ed25519 signature · key {decision.signingKeyId}</dt>
        <dd className="break-all font-mono">{decision.recordSignature}</dd>
      </div>
    </dl>
  );
}

/** A sealed decision and its letter; a superseded one stays listed, marked as such. */
function OneDecision({ decision, current }: { decision: SealedDecisionView; current: boolean }) {
  const outcome = decisionOutcomeLabels[decision.outcome as keyof typeof decisionOutcomeLabels] ?? decision.outcome;
  return (
    <article className={`grid gap-3 rounded-card border p-4 ${current ? 'border-clover bg-white' : 'border-line bg-paper-deep/40'}`}>
      <p className="flex flex-wrap items-center gap-2">
        <Badge tone={current ? 'success' : 'neutral'}>{current ? 'Binding decision' : 'Superseded'}</Badge>
        <span className="text-lg font-bold">{outcome}</span>
        {decision.supersedesId ? <span className="text-sm text-brine">corrects an earlier decision</span> : null}
      </p>
      <DefinitionList
        items={[
          { term: 'Reasons', detail: decision.reasons },
          { term: 'Proposal followed', detail: decision.followedProposal ? 'Yes' : `No — ${decision.departureReason}` },
          {
            term: 'Settlement',
            detail: decision.settlementLines.length ? (
              <ul className="grid gap-1 num">
                {decision.settlementLines.map((line) => (
                  <li key={line}>{line}</li>
                ))}
              </ul>
            ) : (
              'none recorded'
            ),
          },
          { term: 'Signed', detail: `${decision.signerName}, ${formatDateTime(decision.signedAt)}, meaning: ${decision.signatureMeaning}` },
          { term: 'Identity re-checked', detail: `${decision.reauthenticationMethod}, ${formatDateTime(decision.reauthenticatedAt)}` },
        ]}
      />
      <Seal decision={decision} />
      <p className="flex flex-wrap items-center gap-3">
        <a className={buttonClass(current ? 'primary' : 'secondary')} href={decision.letterUrl} download>
          Download the decision letter (PDF)
        </a>
        {decision.verifyUrl ? (
          <a href={decision.verifyUrl} className="text-sm">
            Check this seal on the verification page
          </a>
        ) : null}
      </p>
    </article>
  );
}

export function SealedDecisions({ decisions }: { decisions: SealedDecisionView[] }) {
  return (
    <div className="grid gap-4" data-testid="sealed-decisions">
      {decisions.map((d) => (
        <OneDecision key={d.id} decision={d} current={d.supersededById === null} />
      ))}
      <p className="text-xs text-brine">
        The case is sealed: its record — delivery, results, readings, samples and custody, evidence and notes — is hashed and signed with the decision, and can no longer be changed. The proposal supported the board, which decided; local regulations and the supply contract prevail.
      </p>
    </div>
  );
}
