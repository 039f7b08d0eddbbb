'use client';

import dynamic from 'next/dynamic';

// The editor (Tiptap and ProseMirror) is the heaviest script of the case page: it is fetched only
// once someone asks to write, reply or edit, never with the page itself.
export const LazyNoteComposer = dynamic(() => import('./note-composer').then((m) => m.NoteComposer), {
  ssr: false,
  loading: () => (
    <p role="status" className="text-sm text-brine" data-testid="note-editor-loading">
      Opening the editor…
    </p>
  ),
});
