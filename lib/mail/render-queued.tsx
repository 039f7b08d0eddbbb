import { render, toPlainText } from '@react-email/components';
import type { QueuedContent } from './queued-content';
import { CaseNoticeMail } from './templates/case-notice';
import { NotePostedMail } from './templates/note-posted';

function element(content: QueuedContent) {
  switch (content.layout) {
    case 'case-notice':
      return <CaseNoticeMail {...content.props} />;
    case 'note-posted':
      return <NotePostedMail {...content.props} />;
  }
}

/** The html and text of a queued message; the text is derived from the html, as for every mail. */
export async function renderQueued(content: QueuedContent): Promise<{ html: string; text: string }> {
  const html = await render(element(content));
  return { html, text: toPlainText(html) };
}
