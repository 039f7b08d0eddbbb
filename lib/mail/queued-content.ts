import type { CaseNoticeProps } from './templates/case-notice';
import type { NotePostedProps } from './templates/note-posted';

/**
 * What a queued message will say, as data: it is written in the transaction of the change it tells
 * of, and rendered later by the delivery worker, so no request waits on rendering or on SMTP.
 */
export type QueuedContent = { layout: 'case-notice'; props: CaseNoticeProps } | { layout: 'note-posted'; props: NotePostedProps };
