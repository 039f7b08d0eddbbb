import type { QueuedContent } from './queued-content';
import { renderMail } from './render-mail';
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

/** The html and text of a queued message. */
export function renderQueued(content: QueuedContent): Promise<{ html: string; text: string }> {
  return renderMail(element(content));
}
