'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { LazyNoteComposer } from './lazy-note-composer';
import type { People } from './note-composer';

/** "Write a note" first; the editor is loaded and opened, with the caret in it, when it is clicked. */
export function NewNote({ caseId, people, organisationName }: { caseId: string; people: People; organisationName: string }) {
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <div>
        <Button type="button" data-testid="write-note" onClick={() => setOpen(true)}>
          Write a note
        </Button>
      </div>
    );
  }
  return <LazyNoteComposer caseId={caseId} mode={{ kind: 'new' }} people={people} organisationName={organisationName} autoFocus />;
}
