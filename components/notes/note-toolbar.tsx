'use client';

import { useState } from 'react';
import { useEditorState, type Editor } from '@tiptap/react';
import { safeHref } from '@/lib/notes/links';

const buttonClass = (active: boolean) =>
  `rounded-control border px-2 py-1 text-sm ${active ? 'border-frost bg-frost-soft text-frost-dark' : 'border-line bg-white text-ink hover:border-brine'} disabled:opacity-50`;

/** Bold, italic, the two lists and links: what a note may hold, and nothing more. */
export function NoteToolbar({ editor, idPrefix }: { editor: Editor | null; idPrefix: string }) {
  const state = useEditorState({
    editor,
    selector: ({ editor: e }) =>
      e
        ? { bold: e.isActive('bold'), italic: e.isActive('italic'), bulletList: e.isActive('bulletList'), orderedList: e.isActive('orderedList'), link: e.isActive('link'), href: (e.getAttributes('link').href as string | undefined) ?? '' }
        : null,
  });
  const [linkOpen, setLinkOpen] = useState(false);
  const [href, setHref] = useState('');
  const [linkError, setLinkError] = useState<string | null>(null);
  const disabled = !editor;

  const openLink = () => {
    setHref(state?.href ?? '');
    setLinkError(null);
    setLinkOpen(true);
  };
  const applyLink = () => {
    if (!editor) return;
    const trimmed = href.trim();
    if (!trimmed) {
      editor.chain().focus().extendMarkRange('link').unsetLink().run();
      setLinkOpen(false);
      return;
    }
    // A bare address ("example.org/x") is meant as a web address.
    const candidate = /^[a-z][a-z0-9+.-]*:|^[/#?]/i.test(trimmed) ? trimmed : `https://${trimmed}`;
    const safe = safeHref(candidate);
    if (!safe) {
      setLinkError('A link may point only to a web address (http or https), an e-mail address (mailto:) or a page of this site.');
      return;
    }
    const chain = editor.chain().focus().extendMarkRange('link');
    if (editor.state.selection.empty && !editor.isActive('link')) chain.insertContent({ type: 'text', text: safe, marks: [{ type: 'link', attrs: { href: safe } }] }).run();
    else chain.setLink({ href: safe }).run();
    setLinkOpen(false);
  };

  return (
    <div className="grid gap-2">
      <div role="toolbar" aria-label="Formatting" className="flex flex-wrap gap-1">
        <button type="button" className={buttonClass(!!state?.bold)} aria-pressed={!!state?.bold} disabled={disabled} onClick={() => editor?.chain().focus().toggleBold().run()}>
          <strong>B</strong>
          <span className="sr-only"> Bold</span>
        </button>
        <button type="button" className={buttonClass(!!state?.italic)} aria-pressed={!!state?.italic} disabled={disabled} onClick={() => editor?.chain().focus().toggleItalic().run()}>
          <em>I</em>
          <span className="sr-only"> Italic</span>
        </button>
        <button type="button" className={buttonClass(!!state?.bulletList)} aria-pressed={!!state?.bulletList} disabled={disabled} onClick={() => editor?.chain().focus().toggleBulletList().run()}>
          • List
        </button>
        <button type="button" className={buttonClass(!!state?.orderedList)} aria-pressed={!!state?.orderedList} disabled={disabled} onClick={() => editor?.chain().focus().toggleOrderedList().run()}>
          1. List
        </button>
        <button type="button" className={buttonClass(!!state?.link || linkOpen)} aria-pressed={!!state?.link} aria-expanded={linkOpen} disabled={disabled} onClick={openLink}>
          Link
        </button>
      </div>
      {linkOpen ? (
        <div className="grid gap-1 rounded-control border border-line bg-paper-deep/40 p-2">
          <label htmlFor={`${idPrefix}-href`} className="text-sm font-bold">
            Link address
          </label>
          <div className="flex flex-wrap gap-2">
            <input
              id={`${idPrefix}-href`}
              type="text"
              inputMode="url"
              value={href}
              onChange={(e) => setHref(e.target.value)}
              onKeyDown={(e) => {
                if (e.key === 'Enter') {
                  e.preventDefault();
                  applyLink();
                }
              }}
              placeholder="https://… or mailto:…"
              aria-invalid={!!linkError || undefined}
              aria-describedby={linkError ? `${idPrefix}-href-error` : `${idPrefix}-href-hint`}
              className="min-w-64 flex-1 rounded-control border border-line bg-white px-2 py-1 text-sm aria-[invalid=true]:border-rust"
            />
            <button type="button" className={buttonClass(false)} onClick={applyLink}>
              Apply link
            </button>
            {state?.link ? (
              <button type="button" className={buttonClass(false)} onClick={() => { editor?.chain().focus().extendMarkRange('link').unsetLink().run(); setLinkOpen(false); }}>
                Remove link
              </button>
            ) : null}
            <button type="button" className={buttonClass(false)} onClick={() => setLinkOpen(false)}>
              Cancel
            </button>
          </div>
          {linkError ? (
            <p id={`${idPrefix}-href-error`} role="alert" className="text-sm font-bold text-rust">
              ✕ {linkError}
            </p>
          ) : (
            <p id={`${idPrefix}-href-hint`} className="text-xs text-brine">
              Select words first to link them; otherwise the address itself is inserted.
            </p>
          )}
        </div>
      ) : null}
    </div>
  );
}
