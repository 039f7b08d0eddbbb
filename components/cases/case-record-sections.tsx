import type { ReactNode } from 'react';
import type { CaseFile } from '@/lib/dal/case-file';
import { formatDateTime } from '@/lib/format/dates';
import { Card, DefinitionList, EmptyState } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';

// The notes' own section: threads, the rich-text editor and its safe renderer.
export { NotesSection as Notes } from '@/components/notes/notes-section';

const outcomeLabels: Record<string, string> = { uphold: 'Rejection upheld', reverse: 'Rejection reversed', adjust: 'Result adjusted', further_test: 'Further test ordered' };

/** `sealed` is the full sealed view (settlement, seal, letter) when the page has it. */
export function DecisionSection({ file, sealed }: { file: CaseFile; sealed?: ReactNode }) {
  const [current] = file.decisions;
  return (
    <Card id="decision" title="Decision">
      {current && sealed ? (
        sealed
      ) : !current ? (
        <EmptyState title={file.status === 'withdrawn' ? 'The dispute was withdrawn; there is no decision.' : 'No decision yet'}>
          {file.status === 'review' ? 'The case is before the board.' : file.status === 'withdrawn' ? null : 'The board decides after the retest.'}
        </EmptyState>
      ) : (
        <DefinitionList
          items={[
            { term: 'Outcome', detail: <Badge tone="success">{outcomeLabels[current.outcome] ?? current.outcome}</Badge> },
            { term: 'Reasons', detail: current.reasons },
            { term: 'Proposal followed', detail: current.followedProposal ? 'Yes' : `No — ${current.departureReason}` },
            { term: 'Signed', detail: `${current.signerName}, ${formatDateTime(current.signedAt)}, meaning: ${current.signatureMeaning}` },
          ]}
        />
      )}
    </Card>
  );
}

const actionLabels: Record<string, string> = { 'case.opened': 'Dispute opened', 'note.created': 'Note written', 'note.edited': 'Note edited', 'case.transitioned': 'Status changed', 'decision.sealed': 'Decision signed and sealed', 'decision.letter_issued': 'Decision letter issued', 'evidence.uploaded': 'Evidence added', 'evidence.removed': 'Evidence withdrawn' };

export function Ledger({ file }: { file: CaseFile }) {
  return (
    <Card id="ledger" title="Ledger">
      {file.ledger.length === 0 ? (
        <EmptyState title="No recorded events" />
      ) : (
        <ol className="grid gap-1 text-sm">
          {file.ledger.map((e) => {
            const change = e.change as { from?: string; to?: string; transition?: string };
            return (
              <li key={e.seq} className="flex flex-wrap gap-x-3 border-b border-line/60 py-1">
                <span className="num text-brine">#{e.seq}</span>
                <span className="num">{formatDateTime(e.at)}</span>
                <span className="font-bold">{actionLabels[e.action] ?? e.action}</span>
                {change.from && change.to ? (
                  <span>
                    {change.from.replaceAll('_', ' ')} → {change.to.replaceAll('_', ' ')}
                  </span>
                ) : null}
                <span className="text-brine">
                  {e.actorName ?? 'system'}
                  {e.actorOrganisation ? `, ${e.actorOrganisation}` : ''}
                </span>
              </li>
            );
          })}
        </ol>
      )}
    </Card>
  );
}

// The evidence section: gallery, uploader and withdrawal (components/evidence).
export { EvidenceSection as Evidence } from '@/components/evidence/evidence-section';
