import { describe, expect, it } from 'vitest';
import { validateNoteBody, mentionedIds, withMentionLabels, type NoteDoc } from '@/lib/notes/validate';
import { safeHref } from '@/lib/notes/links';
import { noteText } from '@/lib/notes/plain-text';
import { noteLimits } from '@/lib/notes/limits';
import { newNoteSchema } from '@/lib/notes/schemas';

const text = (value: string, marks?: unknown[]) => ({ type: 'text', text: value, ...(marks ? { marks } : {}) });
const paragraph = (...content: unknown[]) => ({ type: 'paragraph', content });
const doc = (...content: unknown[]) => ({ type: 'doc', content });
const link = (href: unknown) => [{ type: 'link', attrs: { href } }];
const item = (...content: unknown[]) => ({ type: 'listItem', content });

function refused(input: unknown): string {
  const result = validateNoteBody(input);
  if (result.ok) throw new Error(`Expected a refusal, got ${JSON.stringify(result.doc)}`);
  return result.message;
}

function accepted(input: unknown) {
  const result = validateNoteBody(input);
  if (!result.ok) throw new Error(`Expected acceptance, got “${result.message}”`);
  return result;
}

describe('validateNoteBody accepts what the editor writes', () => {
  it('takes paragraphs with bold and italic, lists, a hard break, links and a mention, and gives their plain text', () => {
    const input = doc(
      paragraph(text('Seal ', [{ type: 'bold' }]), text('intact', [{ type: 'italic' }]), { type: 'hardBreak' }, text('see '), text('the logger file', link('https://example.org/logger'))),
      { type: 'bulletList', content: [item(paragraph(text('first'))), item(paragraph(text('second')), { type: 'orderedList', attrs: { start: 2 }, content: [item(paragraph(text('nested')))] })] },
      paragraph({ type: 'mention', attrs: { id: 'user-1', label: 'Ann Tate' } }, text(' please check '), text('mail', link('mailto:lab@example.org')), text(' or '), text('the case', link('/cases/abc#notes'))),
    );
    const result = accepted(input);
    expect(result.text).toBe(
      ['Seal intact', 'see the logger file (https://example.org/logger)', '• first', '• second', '  2. nested', '@Ann Tate please check mail (mailto:lab@example.org) or the case (/cases/abc#notes)'].join('\n'),
    );
  });

  it('accepts the document as a JSON string too', () => {
    expect(accepted(JSON.stringify(doc(paragraph(text('As text.'))))).text).toBe('As text.');
  });

  it('re-serialises: unknown attributes and keys are dropped, link attributes fixed, attribute values normalised', () => {
    const input = {
      type: 'doc',
      extra: 'x',
      content: [
        { type: 'paragraph', attrs: { style: 'color:red', onclick: 'alert(1)' }, content: [text('x', [{ type: 'link', attrs: { href: 'https://example.org', target: '_self', class: 'evil', onclick: 'alert(1)', title: 'hi' } }])] },
        { type: 'orderedList', attrs: { start: '<script>', type: 'x" onload="y' }, content: [item(paragraph(text('y')))] },
      ],
    };
    const { doc: out } = accepted(input);
    expect(out).toEqual({
      type: 'doc',
      content: [
        { type: 'paragraph', content: [{ type: 'text', text: 'x', marks: [{ type: 'link', attrs: { href: 'https://example.org', target: '_blank', rel: 'noopener noreferrer nofollow', class: null, title: null } }] }] },
        { type: 'orderedList', attrs: { start: 1, type: null }, content: [{ type: 'listItem', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'y' }] }] }] },
      ],
    });
  });

  it('keeps text that looks like markup as text', () => {
    expect(accepted(doc(paragraph(text('<script>alert(1)</script>')))).text).toBe('<script>alert(1)</script>');
  });
});

describe('validateNoteBody refuses', () => {
  it('what is not a document', () => {
    for (const input of [null, 42, 'not json', '{"type":"paragraph"}', [], { type: 'doc', content: 'x' }, { type: 'doc', content: [null] }]) {
      expect(refused(input)).toMatch(/could not be read/);
    }
  });

  it('node and mark types the editor does not offer', () => {
    expect(refused(doc({ type: 'image', attrs: { src: 'x', onerror: 'alert(1)' } }))).toMatch(/does not offer \(“image”\)/);
    expect(refused(doc({ type: 'heading', attrs: { level: 1 }, content: [text('H')] }))).toMatch(/“heading”/);
    expect(refused(doc(paragraph(text('x', [{ type: 'script' }]))))).toMatch(/“script”/);
  });

  it('content in the wrong place', () => {
    expect(refused(doc(text('loose text')))).toMatch(/not laid out/);
    expect(refused(doc({ type: 'bulletList', content: [paragraph(text('no list item'))] }))).toMatch(/not laid out/);
  });

  it.each([
    ['javascript:alert(1)'],
    [' JaVaScRiPt:alert(1)'],
    ['java\tscript:alert(1)'],
    ['\u0001javascript:alert(1)'],
    ['data:text/html;base64,PHNjcmlwdD4='],
    ['vbscript:msgbox(1)'],
    ['file:///etc/passwd'],
    ['//elsewhere.example/path'],
    ['/\\elsewhere.example'],
    ['&#106;avascript:alert(1)'],
    ['https://'],
    ['mailto:'],
  ])('a link to %j', (href) => {
    expect(refused(doc(paragraph(text('x', link(href)))))).toMatch(/A link may point only to/);
  });

  it('a link without an address', () => {
    expect(refused(doc(paragraph(text('x', link(null)))))).toMatch(/has no address/);
  });

  it('an empty note, or one of spaces only', () => {
    expect(refused(doc(paragraph()))).toBe('Write something before you post.');
    expect(refused(doc(paragraph(text('   \u00a0 ')), paragraph()))).toBe('Write something before you post.');
    expect(refused(doc(paragraph(text(''))))).toMatch(/empty piece of text/);
  });

  it('text over the limit, but not at it', () => {
    expect(accepted(doc(paragraph(text('a'.repeat(noteLimits.textChars))))).text).toHaveLength(noteLimits.textChars);
    expect(refused(doc(paragraph(text('a'.repeat(noteLimits.textChars + 1)))))).toMatch(/too long: at most 10,000 characters, this one has 10,001/);
  });

  it('a document over the byte, node or depth limits', () => {
    expect(refused(JSON.stringify(doc(paragraph(text('é'.repeat(60_000))))))).toMatch(/too large/);
    const many = doc(paragraph(text('x'), ...Array.from({ length: noteLimits.nodes }, () => ({ type: 'hardBreak' }))));
    expect(refused(many)).toMatch(/too many parts/);
    let deep: unknown = paragraph(text('deep'));
    for (let i = 0; i < 10; i++) deep = { type: 'bulletList', content: [item(paragraph(text('level')), deep)] };
    expect(refused(doc(deep))).toMatch(/nested too deeply/);
  });

  it('a mention that names nobody', () => {
    expect(refused(doc(paragraph({ type: 'mention', attrs: { label: 'Ann' } })))).toMatch(/does not name a person/);
  });
});

describe('safeHref', () => {
  it('keeps http, https, mailto and links within the site, trimmed', () => {
    expect(safeHref(' https://example.org/a?b#c ')).toBe('https://example.org/a?b#c');
    expect(safeHref('HTTP://example.org')).toBe('HTTP://example.org');
    expect(safeHref('mailto:board@example.org')).toBe('mailto:board@example.org');
    expect(safeHref('/cases/1')).toBe('/cases/1');
    expect(safeHref('#notes')).toBe('#notes');
    expect(safeHref('?page=2')).toBe('?page=2');
    expect(safeHref('evidence/sheet.pdf')).toBe('evidence/sheet.pdf');
  });
});

describe('the note form schema', () => {
  it('returns the re-serialised body and refuses an unknown visibility with its own message', () => {
    const ok = newNoteSchema.safeParse({ body: doc(paragraph(text('Shared.'))), visibility: 'parties' });
    expect(ok.success && ok.data.body).toEqual(doc(paragraph(text('Shared.'))));
    const bad = newNoteSchema.safeParse({ body: doc(paragraph(text('x', link('javascript:alert(1)')))), visibility: 'everyone' });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => [i.path.join('.'), i.message]);
    expect(paths).toEqual(expect.arrayContaining([['visibility', expect.stringMatching(/Choose who may read/)], ['body', expect.stringMatching(/A link may point only to/)]]));
  });
});

describe('mentions', () => {
  it('lists the people mentioned and relabels them with the names the server knows', () => {
    const body = accepted(doc(paragraph({ type: 'mention', attrs: { id: 'u1', label: 'Boss' } }, text(' and '), { type: 'mention', attrs: { id: 'u2', label: 'x' } }))).doc as NoteDoc;
    expect(mentionedIds(body).sort()).toEqual(['u1', 'u2']);
    const relabelled = withMentionLabels(body, new Map([['u1', 'Ann Tate']]));
    expect(noteText(relabelled)).toBe('@Ann Tate and @x');
  });
});
