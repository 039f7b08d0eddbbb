import { describe, expect, it } from 'vitest';
import { renderToStaticMarkup } from 'react-dom/server';
import { NoteBody } from '@/components/notes/note-body';

const text = (value: string, marks?: unknown[]) => ({ type: 'text', text: value, ...(marks ? { marks } : {}) });
const paragraph = (...content: unknown[]) => ({ type: 'paragraph', content });
const doc = (...content: unknown[]) => ({ type: 'doc', content });
const render = (body: unknown) => renderToStaticMarkup(<NoteBody body={body} />);

/** Every element name in the markup, to check nothing but the schema's own came out. */
const tagsIn = (html: string) => [...new Set([...html.matchAll(/<([a-zA-Z][a-zA-Z0-9-]*)/g)].map((m) => m[1].toLowerCase()))].sort();

describe('NoteBody, a stored note drawn as React elements', () => {
  // As stored, bypassing the validator: what a row altered outside the product could hold.
  const hostile = doc(
    paragraph(text('<script>alert(1)</script> and <img src=x onerror=alert(1)> and <a onclick="alert(1)">x</a>')),
    paragraph(text('click me', [{ type: 'link', attrs: { href: 'javascript:alert(1)' } }])),
    paragraph(text('spaced', [{ type: 'link', attrs: { href: ' JaVaScRiPt:alert(1)' } }])),
    paragraph(text('data', [{ type: 'link', attrs: { href: 'data:text/html,<script>alert(1)</script>' } }])),
    paragraph(text('fine', [{ type: 'link', attrs: { href: 'https://example.org/herd', onclick: 'alert(1)', class: 'x" onmouseover="alert(1)' } }])),
  );

  it('escapes markup typed as text, so it reads as the characters typed', () => {
    const html = render(hostile);
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(html).toContain('&lt;a onclick=&quot;alert(1)&quot;&gt;x&lt;/a&gt;');
    expect(tagsIn(html)).toEqual(['a', 'div', 'p', 'span']);
  });

  it('never draws a javascript: or data: address as a link, and keeps the words', () => {
    const html = render(hostile);
    expect(html).not.toMatch(/href="\s*(javascript|data):/i);
    expect(html).not.toMatch(/javascript:/i);
    expect(html).toContain('<span>click me</span>');
    expect(html).toContain('<span>spaced</span>');
    expect(html).toContain('<span>data</span>');
  });

  it('draws an allowed link with its address and safe attributes only, dropping stored event handlers and classes', () => {
    const html = render(hostile);
    expect(html).toContain('<a href="https://example.org/herd" target="_blank" rel="noopener noreferrer nofollow">fine</a>');
    // Inside any tag (text is escaped, so a literal “<” only opens a real element): no event handler.
    expect(html).not.toMatch(/<[a-z][^>]*\son\w+=/i);
    expect(html).not.toContain('class="x');
  });

  it('draws bold, italic, lists and mentions from the schema', () => {
    const html = render(
      doc(
        paragraph(text('Seal ', [{ type: 'bold' }]), text('intact', [{ type: 'italic' }])),
        { type: 'orderedList', attrs: { start: 3 }, content: [{ type: 'listItem', content: [paragraph(text('third'))] }] },
        { type: 'bulletList', content: [{ type: 'listItem', content: [paragraph({ type: 'mention', attrs: { id: 'u1', label: 'Ann <b>Tate</b>' } })] }] },
      ),
    );
    expect(html).toContain('<strong>Seal </strong><em>intact</em>');
    expect(html).toMatch(/<ol start="3"[^>]*><li><p>third<\/p><\/li><\/ol>/);
    expect(html).toContain('@Ann &lt;b&gt;Tate&lt;/b&gt;');
  });

  it('shows only the words of a body that does not fit the schema', () => {
    const html = render(doc({ type: 'iframe', attrs: { src: 'javascript:alert(1)' }, content: [text('inside <b>')] }));
    expect(html).toBe('<p class="whitespace-pre-line break-words">inside &lt;b&gt;</p>');
  });
});
