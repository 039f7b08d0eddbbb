'use client';

import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { EditorContent, useEditor, type JSONContent } from '@tiptap/react';
import { noteExtensionsWith } from '@/lib/notes/extensions';
import { validateNoteBody } from '@/lib/notes/validate';
import { visibilityExplained } from '@/lib/notes/schemas';
import type { FormState } from '@/lib/forms/action';
import { postNoteAction, replyToNoteAction, editNoteAction } from '@/app/(app)/cases/[caseId]/notes-actions';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';
import { NoteToolbar } from './note-toolbar';
import { mentionSuggestion, type MentionablePerson } from './mention-suggestion';

type Visibility = 'parties' | 'internal';
export type ComposerMode = { kind: 'new' } | { kind: 'reply'; parentId: string; visibility: Visibility } | { kind: 'edit'; noteId: string; body: unknown; visibility: Visibility };
export type People = { parties: MentionablePerson[]; internal: MentionablePerson[] };

const editorClass =
  'min-h-24 rounded-control border bg-white px-3 py-2 text-ink shadow-sm focus:border-frost focus:outline-none aria-[invalid=true]:border-rust [&_ol]:list-decimal [&_ol]:pl-6 [&_ul]:list-disc [&_ul]:pl-6 [&_a]:text-frost-dark [&_a]:underline [&_.note-mention]:rounded [&_.note-mention]:bg-frost-soft [&_.note-mention]:px-1 [&_.note-mention]:font-bold';

const labels = {
  new: { field: 'New note', submit: 'Post note', pending: 'Posting…' },
  reply: { field: 'Your reply', submit: 'Post reply', pending: 'Posting…' },
  edit: { field: 'Edit the note', submit: 'Save the edit', pending: 'Saving…' },
};

/** Writes a note, a reply or an edit; checks it in the browser with the server's own rules first. */
export function NoteComposer({ caseId, mode, people, organisationName, onDone, autoFocus = false }: { caseId: string; mode: ComposerMode; people: People; organisationName: string; onDone?: () => void; autoFocus?: boolean }) {
  const id = useId().replace(/:/g, '');
  const [visibility, setVisibility] = useState<Visibility>(mode.kind === 'new' ? 'parties' : mode.visibility);
  const [state, setState] = useState<FormState>(null);
  const [bodyError, setBodyError] = useState<string | null>(null);
  const [visibilityError, setVisibilityError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  // The "@" list reads the current choice, so switching to internal narrows it to the own organisation.
  const audience = useRef<MentionablePerson[]>(people.parties);
  audience.current = visibility === 'internal' ? people.internal : people.parties;

  const extensions = useMemo(() => noteExtensionsWith({ mentionSuggestion: mentionSuggestion(() => audience.current) }), []);
  const editor = useEditor({
    extensions,
    content: mode.kind === 'edit' ? (mode.body as JSONContent) : '',
    // Rendered on the server first: the editor starts in the browser only, after hydration.
    immediatelyRender: false,
    // Opened by a click on "Write a note", "Reply" or "Edit": the caret goes where the user meant to type.
    autofocus: autoFocus ? 'end' : false,
    editorProps: {
      attributes: {
        id: `${id}-body`,
        class: editorClass,
        role: 'textbox',
        'aria-multiline': 'true',
        'aria-label': labels[mode.kind].field,
        'aria-describedby': `${id}-body-hint`,
        'data-testid': 'note-editor',
      },
    },
  });

  useEffect(() => {
    editor?.view.dom.setAttribute('aria-invalid', bodyError ? 'true' : 'false');
    if (bodyError) editor?.view.dom.setAttribute('aria-describedby', `${id}-body-error`);
    else editor?.view.dom.setAttribute('aria-describedby', `${id}-body-hint`);
  }, [editor, bodyError, id]);

  const submit = async (event: React.FormEvent) => {
    event.preventDefault();
    if (!editor || pending) return;
    setState(null);
    setVisibilityError(null);
    const checked = validateNoteBody(editor.getJSON());
    if (!checked.ok) {
      setBodyError(checked.message);
      editor.commands.focus();
      return;
    }
    setBodyError(null);
    setPending(true);
    try {
      const result =
        mode.kind === 'new'
          ? await postNoteAction(caseId, { body: checked.doc, visibility })
          : mode.kind === 'reply'
            ? await replyToNoteAction(caseId, mode.parentId, { body: checked.doc })
            : await editNoteAction(caseId, mode.noteId, { body: checked.doc });
      setState(result);
      if (result?.ok) {
        if (mode.kind !== 'edit') editor.commands.clearContent();
        onDone?.();
      } else {
        setBodyError(result?.fieldErrors?.body?.join(' ') ?? null);
        setVisibilityError(result?.fieldErrors?.visibility?.join(' ') ?? null);
      }
    } finally {
      setPending(false);
    }
  };

  return (
    <form onSubmit={submit} noValidate className="grid gap-3" aria-label={labels[mode.kind].field} data-testid={`note-form-${mode.kind}`}>
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
      {mode.kind === 'new' ? (
        <fieldset className="grid gap-2">
          <legend className="text-sm font-bold text-ink">Who may read it</legend>
          {(['parties', 'internal'] as const).map((option) => (
            <label key={option} className="flex items-start gap-2 rounded-control border border-line bg-white p-2 text-sm has-[:checked]:border-frost">
              <input type="radio" name={`${id}-visibility`} value={option} checked={visibility === option} onChange={() => setVisibility(option)} className="mt-1" />
              <span>
                <span className="font-bold">{option === 'internal' ? `${organisationName} only` : visibilityExplained[option].label}</span>
                <span className="block text-brine">{visibilityExplained[option].explanation}</span>
              </span>
            </label>
          ))}
          {visibilityError ? (
            <p role="alert" className="text-sm font-bold text-rust">
              ✕ {visibilityError}
            </p>
          ) : null}
        </fieldset>
      ) : (
        <p className="text-sm text-brine">
          {visibility === 'internal' ? `Internal to ${organisationName}, like the rest of this thread.` : 'Shared with every party, like the rest of this thread.'}
        </p>
      )}
      <div className="grid gap-1">
        <label htmlFor={`${id}-body`} className="text-sm font-bold text-ink" onClick={() => editor?.commands.focus()}>
          {labels[mode.kind].field}
        </label>
        <NoteToolbar editor={editor} idPrefix={id} />
        <EditorContent editor={editor} />
        {bodyError ? (
          <p id={`${id}-body-error`} role="alert" className="flex items-start gap-1 text-sm font-bold text-rust">
            <span aria-hidden="true">✕</span>
            {bodyError}
          </p>
        ) : (
          <p id={`${id}-body-hint`} className="text-xs text-brine">
            Type @ to mention someone on the case.{mode.kind === 'new' ? ' You can edit a note for 15 minutes after posting; after that, reply to it.' : ''}
          </p>
        )}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={!editor || pending}>
          {pending ? labels[mode.kind].pending : labels[mode.kind].submit}
        </Button>
        {onDone && mode.kind !== 'new' ? (
          <Button type="button" variant="secondary" onClick={onDone}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
