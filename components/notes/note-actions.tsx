'use client';

import { useEffect, useState } from 'react';
import { Button } from '@/components/ui/button';
import { LazyNoteComposer } from './lazy-note-composer';
import type { People } from './note-composer';

type Props = {
  caseId: string;
  noteId: string;
  visibility: 'parties' | 'internal';
  body: unknown;
  /** ISO time until which the viewer may edit, or null. */
  editableUntil: string | null;
  canReply: boolean;
  people: People;
  organisationName: string;
};

/** Reply and edit under one note; edit is offered only to its author while the 15 minutes run. */
export function NoteActions({ caseId, noteId, visibility, body, editableUntil, canReply, people, organisationName }: Props) {
  const [open, setOpen] = useState<'reply' | 'edit' | null>(null);
  const until = editableUntil ? new Date(editableUntil).getTime() : 0;
  const [canEdit, setCanEdit] = useState(false);
  useEffect(() => {
    // Decided in the browser, against its clock, so the button goes when the window closes.
    const left = until - Date.now();
    setCanEdit(left > 0);
    if (left <= 0) return;
    const timer = setTimeout(() => setCanEdit(false), left);
    return () => clearTimeout(timer);
  }, [until]);

  if (!canReply && !canEdit) return null;
  return (
    <div className="mt-2 grid gap-2">
      {open === null ? (
        <div className="flex flex-wrap gap-2">
          {canReply ? (
            <Button type="button" variant="quiet" className="px-0 py-0" onClick={() => setOpen('reply')}>
              Reply
            </Button>
          ) : null}
          {canEdit ? (
            <Button type="button" variant="quiet" className="px-0 py-0" onClick={() => setOpen('edit')}>
              Edit
            </Button>
          ) : null}
        </div>
      ) : (
        <div className="rounded-card border border-line bg-paper-deep/40 p-3">
          <LazyNoteComposer
            caseId={caseId}
            mode={open === 'reply' ? { kind: 'reply', parentId: noteId, visibility } : { kind: 'edit', noteId, body, visibility }}
            people={people}
            organisationName={organisationName}
            onDone={() => setOpen(null)}
            autoFocus
          />
        </div>
      )}
    </div>
  );
}
