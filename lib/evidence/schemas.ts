import { z } from 'zod';
import { attachmentKinds } from './kinds';

export const CAPTION_MAX_CHARS = 300;
export const REMOVAL_REASON_MAX_CHARS = 500;

const optionalCaption = z
  .string()
  .trim()
  .max(CAPTION_MAX_CHARS, `Keep the caption to ${CAPTION_MAX_CHARS} characters.`)
  .optional()
  .transform((value) => (value ? value : null));

/** What the uploader sends with its files; the route's kind must match the kind named here. */
export const uploadInputSchema = z.object({
  caseId: z.uuid('That case was not found.'),
  kind: z.enum(attachmentKinds, 'Choose what kind of evidence this is.'),
  caption: optionalCaption,
});
export type UploadInput = z.input<typeof uploadInputSchema>;

/** What the upload service hands back to onUploadComplete: set by our middleware, signed by the service. */
export const uploadMetadataSchema = z.object({
  caseId: z.uuid(),
  kind: z.enum(attachmentKinds),
  caption: z.string().nullable(),
  userId: z.string().min(1),
  sessionId: z.string().min(1),
  organisationId: z.uuid(),
  origin: z.string(),
});
export type UploadMetadata = z.infer<typeof uploadMetadataSchema>;

/** What the browser learns about each file once the server has checked it. */
export type UploadOutcome = { ok: true; attachmentId: string; fileName: string; sha256: string } | { ok: false; fileName: string; reason: string };

export const removeAttachmentSchema = z.object({
  caseId: z.uuid('That case was not found.'),
  attachmentId: z.uuid('That file was not found.'),
  reason: z
    .string()
    .trim()
    .min(5, 'Say in a few words why the file is withdrawn; the board reads it.')
    .max(REMOVAL_REASON_MAX_CHARS, `Keep the reason to ${REMOVAL_REASON_MAX_CHARS} characters.`),
});
export type RemoveAttachmentInput = z.input<typeof removeAttachmentSchema>;
