import type { ReactNode } from 'react';
import { getSchema, type JSONContent } from '@tiptap/core';
import { Node as ProseMirrorNode, type Schema } from '@tiptap/pm/model';
import { renderToReactElement } from '@tiptap/static-renderer/pm/react';
import { noteExtensions } from '@/lib/notes/extensions';
import { safeHref } from '@/lib/notes/links';

let cachedSchema: Schema | null = null;
const schema = () => (cachedSchema ??= getSchema(noteExtensions));

const bodyClass =
  'grid gap-1 break-words [&_ol]:list-decimal [&_ol]:pl-6 [&_ul]:list-disc [&_ul]:pl-6 [&_li>p]:my-0 [&_a]:text-frost-dark [&_a]:underline';

/** Every string in a stored document, joined, for a body that no longer fits the schema. */
function everyText(node: unknown): string {
  if (!node || typeof node !== 'object') return '';
  const { text, content } = node as { text?: unknown; content?: unknown };
  if (typeof text === 'string') return text;
  return Array.isArray(content) ? content.map(everyText).join(' ') : '';
}

/**
 * A stored note as React elements, drawn from the notes' own schema: React escapes every text, a
 * link is drawn only when its address passes the same rule as on write (javascript: never becomes an
 * href), and nothing is ever set as HTML. Usable on the server and in the browser.
 */
export function NoteBody({ body }: { body: unknown }) {
  let doc: ProseMirrorNode;
  try {
    doc = ProseMirrorNode.fromJSON(schema(), body as JSONContent);
    doc.check();
  } catch {
    // A body stored before the current rules, or altered outside the product: its words, and nothing else.
    return <p className="whitespace-pre-line break-words">{everyText(body)}</p>;
  }
  const rendered = renderToReactElement({
    content: doc,
    extensions: noteExtensions,
    options: {
      markMapping: {
        link: ({ mark, children }) => {
          const href = safeHref(mark.attrs.href);
          return href ? (
            <a href={href} target="_blank" rel="noopener noreferrer nofollow">
              {children as ReactNode}
            </a>
          ) : (
            <span>{children as ReactNode}</span>
          );
        },
      },
      nodeMapping: {
        mention: ({ node }) => (
          <span data-type="mention" className="rounded bg-frost-soft px-1 font-bold text-frost-dark">
            @{typeof node.attrs.label === 'string' ? node.attrs.label : 'someone'}
          </span>
        ),
      },
      // Nothing outside the schema reaches here after the check above; if it did, it is left out.
      unhandledNode: () => null,
      unhandledMark: ({ children }) => <>{children as ReactNode}</>,
    },
  });
  return <div className={bodyClass}>{rendered}</div>;
}
