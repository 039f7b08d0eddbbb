import type { ReactElement } from 'react';
import { toPlainText } from '@react-email/components';

// The doctype mail clients expect, as the mail components' own renderer writes it.
const DOCTYPE = '<!DOCTYPE html PUBLIC "-//W3C//DTD XHTML 1.0 Transitional//EN" "http://www.w3.org/TR/xhtml1/DTD/xhtml1-transitional.dtd">';

/**
 * The html and text of a mail; the text is derived from the html, as for every mail. Our templates
 * are plain markup, with nothing that suspends, so static rendering gives the same document as the
 * components' streaming renderer, without its stream markers, in a quarter of the time.
 */
export async function renderMail(element: ReactElement): Promise<{ html: string; text: string }> {
  // Loaded when called, as the components' renderer does: route handlers may not import it statically.
  const { renderToStaticMarkup } = await import('react-dom/server');
  const html = `${DOCTYPE}${renderToStaticMarkup(element)}`;
  return { html, text: toPlainText(html) };
}
