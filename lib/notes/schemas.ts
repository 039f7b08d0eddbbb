import { z } from 'zod';
import { noteVisibilities } from '@/lib/enums';
import { validateNoteBody, type NoteDoc } from './validate';

/** The body field: editor JSON checked against the notes' schema, and returned re-serialised. */
export const noteBodySchema = z.unknown().transform((value, ctx): NoteDoc => {
  const result = validateNoteBody(value);
  if (!result.ok) {
    ctx.addIssue({ code: 'custom', message: result.message });
    return z.NEVER;
  }
  return result.doc;
});

export const noteVisibilitySchema = z.enum(noteVisibilities, { error: 'Choose who may read the note: everyone on the case, or your organisation only.' });

/** A new thread: the body and who may read it. */
export const newNoteSchema = z.object({ body: noteBodySchema, visibility: noteVisibilitySchema });

/** A reply: the body only; it is read by whoever may read the thread. */
export const replySchema = z.object({ body: noteBodySchema, visibility: noteVisibilitySchema.optional() });

/** An edit: the new body. */
export const editNoteSchema = z.object({ body: noteBodySchema });

export type NewNoteInput = z.infer<typeof newNoteSchema>;
export type ReplyInput = z.infer<typeof replySchema>;
export type EditNoteInput = z.infer<typeof editNoteSchema>;

export const visibilityExplained: Record<(typeof noteVisibilities)[number], { label: string; explanation: string }> = {
  parties: {
    label: 'Everyone on the case',
    explanation: 'The supplier, the plant, the referee laboratory and the board can read it, and the other parties are told by e-mail. The referee laboratory reads it only once it has submitted its retest.',
  },
  internal: {
    label: 'My organisation only',
    explanation: 'Only people of your own organisation can read it; nobody is e-mailed. Use it for working notes: anything the board should weigh must be shared with every party.',
  },
};
