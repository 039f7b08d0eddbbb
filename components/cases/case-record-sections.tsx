import type { ReactNode } from 'react';
import type { CaseFile } from '@/lib/dal/case-file';
import { formatDateTime } from '@/lib/format/dates';
import { Card, DefinitionList, EmptyState } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';

type RichNode = { type?: string; text?: string; content?: RichNode[] };

/** Plain text of a stored note body, for read-only display; nothing in it is ever interpreted as markup. */
function plainText(node: RichNode): string {
  if (typeof node?.text === 'string') return node.text;
  const parts = Array.isArray(node?.content) ? node.content.map(plainText) : [];
  return parts.join(node?.type === 'doc' ? '\n' : '');
}

export function Notes({ file }: { file: CaseFile }) {
  return (
    <Card id="notes" title="Notes">
      {file.notes.length === 0 ? (
        <EmptyState title="No notes yet" />
      ) : (
        <ul className="grid gap-3">
          {file.notes.map((n) => (
            <li key={n.id} className="rounded-card border border-line bg-white p-3">
              <p className="mb-1 flex flex-wrap items-center gap-2 text-xs text-brine">
                <span className="font-bold text-ink">{n.authorName}</span> · {n.organisation} · {formatDateTime(n.createdAt)}
                {n.visibility === 'internal' ? <Badge tone="warning">Internal to {n.organisation}</Badge> : null}
              </p>
              <p className="whitespace-pre-line">{plainText(n.body as RichNode)}</p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

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

const actionLabels: Record<string, string> = { 'case.opened': 'Dispute opened', 'case.transitioned': 'Status changed', 'decision.sealed': 'Decision signed and sealed', 'decision.letter_issued': 'Decision letter issued' };

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

export function Evidence({ file }: { file: CaseFile }) {
  return (
    <Card id="evidence" title="Evidence">
      {file.attachments.length === 0 ? (
        <EmptyState title="No files attached to this case" />
      ) : (
        <ul className="grid gap-2 text-sm">
          {file.attachments.map((a) => (
            <li key={a.id} className="rounded-card border border-line bg-white p-3">
              <p className="font-bold">
                {a.fileName} <span className="font-normal text-brine">· {a.kind.replaceAll('_', ' ')} · {(a.sizeBytes / 1024).toFixed(0)} KiB</span>
                {a.removedAt ? <Badge tone="neutral">Removed {formatDateTime(a.removedAt)}</Badge> : null}
              </p>
              {a.caption ? <p>{a.caption}</p> : null}
              <p className="text-xs text-brine">
                {a.uploaderName} · {formatDateTime(a.createdAt)} · SHA-256 <span className="break-all font-mono">{a.sha256}</span>
              </p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
