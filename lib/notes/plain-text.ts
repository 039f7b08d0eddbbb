import type { JSONContent } from '@tiptap/core';

type Block = { lines: string[] };

// Stored bodies are read defensively: one written before the current rules must not break a page.
const childrenOf = (node: JSONContent): JSONContent[] => (Array.isArray(node?.content) ? node.content.filter((c) => c && typeof c === 'object') : []);

function inline(node: JSONContent): string {
  if (node.type === 'text') {
    const text = typeof node.text === 'string' ? node.text : '';
    const href = (Array.isArray(node.marks) ? node.marks : []).find((m) => m.type === 'link')?.attrs?.href;
    // In mail and search the address matters as much as the words it hangs on.
    return typeof href === 'string' && href !== text ? `${text} (${href})` : text;
  }
  if (node.type === 'mention') return `@${typeof node.attrs?.label === 'string' ? node.attrs.label : 'someone'}`;
  if (node.type === 'hardBreak') return '\n';
  return childrenOf(node).map(inline).join('');
}

function blocks(node: JSONContent, indent: string, out: Block): void {
  switch (node.type) {
    case 'paragraph':
      out.lines.push(indent + inline(node).replaceAll('\n', `\n${indent}`));
      return;
    case 'bulletList':
    case 'orderedList': {
      const start = node.type === 'orderedList' && typeof node.attrs?.start === 'number' ? node.attrs.start : 1;
      childrenOf(node).forEach((item, i) => {
        const marker = node.type === 'orderedList' ? `${start + i}. ` : '• ';
        const inner: Block = { lines: [] };
        for (const child of childrenOf(item)) blocks(child, '', inner);
        const [first = '', ...rest] = inner.lines.join('\n').split('\n');
        out.lines.push(indent + marker + first, ...rest.map((line) => indent + ' '.repeat(marker.length) + line));
      });
      return;
    }
    default:
      for (const child of childrenOf(node)) blocks(child, indent, out);
  }
}

/** The note as plain text, for mail, search and anywhere markup has no place. */
export function noteText(doc: JSONContent): string {
  const out: Block = { lines: [] };
  if (!doc || typeof doc !== 'object') return '';
  blocks(doc, '', out);
  return out.lines.join('\n').trim();
}

/** The first characters of a note, cut at a word, for a subject line or a mail excerpt. */
export function noteExcerpt(doc: JSONContent, maxChars: number): string {
  const text = noteText(doc);
  if (text.length <= maxChars) return text;
  const cut = text.slice(0, maxChars);
  const lastSpace = cut.lastIndexOf(' ');
  return `${(lastSpace > maxChars * 0.6 ? cut.slice(0, lastSpace) : cut).trimEnd()}…`;
}
