import { getSchema, type JSONContent } from '@tiptap/core';
import { Node as ProseMirrorNode, type Schema } from '@tiptap/pm/model';
import { noteExtensions } from './extensions';
import { noteLimits } from './limits';
import { safeHref } from './links';
import { noteText } from './plain-text';

export type NoteDoc = JSONContent & { type: 'doc' };
export type NoteValidation = { ok: true; doc: NoteDoc; text: string } | { ok: false; message: string };

let cachedSchema: Schema | null = null;
function noteSchema(): Schema {
  cachedSchema ??= getSchema(noteExtensions);
  return cachedSchema;
}

const refuse = (message: string): NoteValidation => ({ ok: false, message });
const UNREADABLE = 'The note could not be read. Reload the page and write it again.';
const orderedListTypes = new Set(['1', 'a', 'A', 'i', 'I']);

function shown(value: string, max = 60): string {
  return value.length > max ? `${value.slice(0, max)}…` : value;
}

/**
 * Walks the raw JSON without recursion before ProseMirror sees it, so an absurdly deep or wide
 * document is refused cheaply instead of exhausting the stack.
 */
function measure(json: unknown): { depth: number; nodes: number } | 'too-deep' | 'too-many' | 'malformed' {
  const stack: { node: unknown; depth: number }[] = [{ node: json, depth: 0 }];
  let nodes = 0;
  let depth = 0;
  while (stack.length) {
    const { node, depth: at } = stack.pop()!;
    if (!node || typeof node !== 'object' || Array.isArray(node)) return 'malformed';
    nodes += 1;
    depth = Math.max(depth, at);
    if (at > noteLimits.depth) return 'too-deep';
    if (nodes > noteLimits.nodes) return 'too-many';
    const content = (node as { content?: unknown }).content;
    if (content === undefined) continue;
    if (!Array.isArray(content)) return 'malformed';
    for (const child of content) stack.push({ node: child, depth: at + 1 });
  }
  return { depth, nodes };
}

/**
 * Rebuilds each node and mark with only the attributes the product uses, in the form it stores them.
 * ProseMirror has already dropped attributes its schema does not know; this fixes the values of the
 * ones it does, so nothing a crafted request puts in an attribute reaches storage.
 */
function normalise(node: JSONContent, problems: string[]): JSONContent {
  const out: JSONContent = { type: node.type };
  if (node.type === 'text') out.text = node.text;
  if (node.type === 'orderedList') {
    const start = node.attrs?.start;
    const type = node.attrs?.type;
    out.attrs = {
      start: Number.isInteger(start) && start >= 1 && start <= 9999 ? start : 1,
      type: typeof type === 'string' && orderedListTypes.has(type) ? type : null,
    };
  }
  if (node.type === 'mention') {
    const id = node.attrs?.id;
    const label = node.attrs?.label;
    if (typeof id !== 'string' || id.length === 0 || id.length > 200) problems.push('A mention does not name a person. Remove it and choose the person from the list.');
    out.attrs = { id: typeof id === 'string' ? id : null, label: typeof label === 'string' ? label.slice(0, 200) : null, mentionSuggestionChar: '@' };
  }
  if (node.marks?.length) {
    out.marks = node.marks.map((mark) => {
      if (mark.type !== 'link') return { type: mark.type };
      const raw = mark.attrs?.href;
      const href = safeHref(raw);
      if (href === null) {
        problems.push(
          typeof raw === 'string' && raw.trim()
            ? `A link may point only to a web address (http or https), an e-mail address (mailto) or a page of this site; “${shown(raw.trim())}” is not allowed.`
            : 'A link has no address. Remove the link or give it one.',
        );
      }
      return { type: 'link', attrs: { href, target: '_blank', rel: 'noopener noreferrer nofollow', class: null, title: null } };
    });
  }
  if (node.content?.length) out.content = node.content.map((child) => normalise(child, problems));
  return out;
}

/**
 * Checks a note body as it arrives (editor JSON, or its text) against the notes' schema and limits,
 * and returns it re-serialised with only what the schema allows, plus its plain text. The same check
 * runs in the browser before sending and on the server before storing.
 */
export function validateNoteBody(input: unknown): NoteValidation {
  let json: unknown = input;
  if (typeof input === 'string') {
    if (new TextEncoder().encode(input).length > noteLimits.jsonBytes) return refuse(`The note is too large to store (at most ${noteLimits.jsonBytes / 1000} kB). Shorten it, or attach the text as evidence.`);
    try {
      json = JSON.parse(input);
    } catch {
      return refuse(UNREADABLE);
    }
  } else {
    let size = 0;
    try {
      size = new TextEncoder().encode(JSON.stringify(input) ?? '').length;
    } catch {
      return refuse(UNREADABLE);
    }
    if (size > noteLimits.jsonBytes) return refuse(`The note is too large to store (at most ${noteLimits.jsonBytes / 1000} kB). Shorten it, or attach the text as evidence.`);
  }
  if (!json || typeof json !== 'object' || (json as { type?: unknown }).type !== 'doc') return refuse(UNREADABLE);

  const size = measure(json);
  if (size === 'malformed') return refuse(UNREADABLE);
  if (size === 'too-deep') return refuse('The note is nested too deeply (lists within lists within lists). Flatten the lists and try again.');
  if (size === 'too-many') return refuse(`The note has too many parts (at most ${noteLimits.nodes}). Shorten it, or attach the text as evidence.`);

  let parsed: ProseMirrorNode;
  try {
    parsed = ProseMirrorNode.fromJSON(noteSchema(), json);
    parsed.check();
  } catch (error) {
    const reason = error instanceof Error ? error.message : '';
    const unknown = /Unknown node type: (\S+)|There is no mark type (\S+)/.exec(reason);
    if (unknown) return refuse(`The note holds something the editor does not offer (“${shown(unknown[1] ?? unknown[2], 40)}”). Remove it and try again.`);
    if (/Empty text nodes/.test(reason)) return refuse('The note has an empty piece of text. Reload the page and write it again.');
    return refuse('The note is not laid out as the editor writes notes (for example, text directly in a list). Rewrite it in the editor and try again.');
  }

  const problems: string[] = [];
  const doc = normalise(parsed.toJSON() as JSONContent, problems) as NoteDoc;
  if (problems.length) return refuse(problems[0]);
  const text = noteText(doc);
  if (text.length === 0) return refuse('Write something before you post.');
  if (text.length > noteLimits.textChars) return refuse(`The note is too long: at most ${noteLimits.textChars.toLocaleString('en-GB')} characters, this one has ${text.length.toLocaleString('en-GB')}. Shorten it, or attach the text as evidence.`);
  return { ok: true, doc, text };
}

/** The ids of the people a note mentions, for checking they are on the case. */
export function mentionedIds(doc: JSONContent): string[] {
  const ids = new Set<string>();
  const stack: JSONContent[] = [doc];
  while (stack.length) {
    const node = stack.pop()!;
    if (node.type === 'mention' && typeof node.attrs?.id === 'string') ids.add(node.attrs.id);
    if (node.content) stack.push(...node.content);
  }
  return [...ids];
}

/** Replaces each mention's label with the name the server knows, so a post cannot misname someone. */
export function withMentionLabels(doc: NoteDoc, names: ReadonlyMap<string, string>): NoteDoc {
  const visit = (node: JSONContent): JSONContent => ({
    ...node,
    ...(node.type === 'mention' && typeof node.attrs?.id === 'string' ? { attrs: { ...node.attrs, label: names.get(node.attrs.id) ?? node.attrs.label } } : {}),
    ...(node.content ? { content: node.content.map(visit) } : {}),
  });
  return visit(doc) as NoteDoc;
}
