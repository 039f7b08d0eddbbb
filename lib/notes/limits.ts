/**
 * How big a note may be. A case note is a paragraph or a short list, not a report (a report goes in
 * as evidence); the limits keep a single post readable and keep a crafted document from costing the
 * server time to check or the browser time to draw. Common practice, no published source.
 */
export const noteLimits = {
  /** Characters of text, mentions counted as their label. */
  textChars: 10_000,
  /** Nodes of the document, text runs included. */
  nodes: 2_000,
  /** Levels of nesting below the document (a list in a list in a list…). */
  depth: 12,
  /** Bytes of the JSON as sent. */
  jsonBytes: 100_000,
  /** Minutes after posting during which the author may still edit. */
  editWindowMinutes: 15,
} as const;

export const NOTE_EDIT_WINDOW_MS = noteLimits.editWindowMinutes * 60_000;
