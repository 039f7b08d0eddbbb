import { getDb } from '@/db/client';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import type { CaseFile } from '@/lib/dal/case-file';
import { mentionablePeople, NOTES_CLOSED_MESSAGE, notesClosed } from '@/lib/dal/notes';
import { formatDateTime } from '@/lib/format/dates';
import { Card, EmptyState } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { NoteBody } from './note-body';
import { NoteActions } from './note-actions';
import { NewNote } from './new-note';

type CaseNote = CaseFile['notes'][number];

/** Roots in order, each with its replies; a reply whose thread the reader cannot see stands on its own. */
function threadsOf(notes: CaseNote[]) {
  const ids = new Set(notes.map((n) => n.id));
  const roots = notes.filter((n) => n.parentId === null || !ids.has(n.parentId));
  return roots.map((root) => ({ root, replies: notes.filter((n) => n.parentId === root.id) }));
}

function NoteCard({ n, reply = false }: { n: CaseNote; reply?: boolean }) {
  return (
    <article aria-label={`${reply ? 'Reply' : 'Note'} by ${n.authorName}`} data-note-id={n.id} className="grid gap-1">
      <p className="flex flex-wrap items-center gap-2 text-xs text-brine">
        <span className="font-bold text-ink">{n.authorName}</span> · {n.organisation} · <time dateTime={n.createdAt.toISOString()}>{formatDateTime(n.createdAt)}</time>
        {!reply && n.visibility === 'internal' ? <Badge tone="warning">Internal to {n.organisation}</Badge> : null}
        {!reply && n.visibility === 'parties' ? <Badge tone="neutral">Shared with every party</Badge> : null}
      </p>
      <NoteBody body={n.body} />
      {n.editedAt ? (
        <details className="text-xs text-brine">
          <summary className="cursor-pointer">
            Edited {formatDateTime(n.editedAt)} — {n.revisions.length === 1 ? 'see the earlier version' : `see the ${n.revisions.length} earlier versions`}
          </summary>
          <ol className="mt-2 grid gap-2 border-l-2 border-line pl-3">
            {n.revisions.map((r, i) => (
              <li key={i} className="grid gap-1">
                <p className="font-bold">
                  {i === 0 ? 'As first posted' : `Version ${i + 1}`}, replaced {formatDateTime(r.replacedAt)}
                </p>
                <div className="text-sm text-ink-soft">
                  <NoteBody body={r.body} />
                </div>
              </li>
            ))}
          </ol>
        </details>
      ) : null}
    </article>
  );
}

/** The case's notes in threads, with the composer while the case is open. */
export async function NotesSection({ file, actor }: { file: CaseFile; actor: Actor }) {
  const closed = notesClosed(file.status);
  const writer = can(actor.role, 'note', 'write') && !closed;
  const people = writer ? await mentionablePeople(getDb(), actor, file.id) : { parties: [], internal: [] };
  const threads = threadsOf(file.notes);
  const shared = { caseId: file.id, people, organisationName: actor.organisationName };
  return (
    <Card id="notes" title="Notes">
      <div className="grid gap-4">
        {file.blind ? (
          <p className="text-sm text-brine">Until your retest is submitted you see only your own laboratory’s notes; the other parties’ notes open to you after that.</p>
        ) : null}
        {threads.length === 0 ? (
          <EmptyState title="No notes yet">{closed ? null : 'Notes are where the parties and the board discuss the case in writing.'}</EmptyState>
        ) : (
          <ul className="grid gap-3">
            {threads.map(({ root, replies }) => (
              <li key={root.id} className={`rounded-card border bg-white p-3 ${root.visibility === 'internal' ? 'border-amber border-dashed' : 'border-line'}`}>
                <NoteCard n={root} />
                <NoteActions {...shared} noteId={root.id} visibility={root.visibility} body={root.body} editableUntil={root.editableUntil?.toISOString() ?? null} canReply={writer} />
                {replies.length ? (
                  <ul className="mt-3 grid gap-3 border-l-2 border-line pl-4" aria-label="Replies">
                    {replies.map((r) => (
                      <li key={r.id}>
                        <NoteCard n={r} reply />
                        <NoteActions {...shared} noteId={r.id} visibility={r.visibility} body={r.body} editableUntil={r.editableUntil?.toISOString() ?? null} canReply={false} />
                      </li>
                    ))}
                  </ul>
                ) : null}
              </li>
            ))}
          </ul>
        )}
        {closed ? (
          <p role="note" className="rounded-control border border-line bg-paper-deep px-3 py-2 text-sm font-bold text-ink-soft">
            {NOTES_CLOSED_MESSAGE[file.status as keyof typeof NOTES_CLOSED_MESSAGE]}
          </p>
        ) : writer ? (
          <div className="rounded-card border border-line bg-paper-deep/40 p-3">
            <NewNote {...shared} />
          </div>
        ) : null}
      </div>
    </Card>
  );
}
