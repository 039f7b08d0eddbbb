import type { AttachmentKind } from '@/lib/enums';

export type { AttachmentKind };

// The browser bundle uses this file too, so it names the kinds itself rather than importing the
// table module; `kindRules` below is typed by the table's kinds, so a kind missing here fails to compile.
export const attachmentKinds = ['lab_sheet', 'photo', 'calibration_certificate', 'correspondence', 'other'] as const satisfies readonly AttachmentKind[];
type Assert<T extends true> = T;
type KindsListed = Assert<[AttachmentKind] extends [(typeof attachmentKinds)[number]] ? true : false>;

/** The content types evidence may have, each with the file-name extensions that name it. */
export const evidenceTypes = {
  'application/pdf': { extensions: ['pdf'], label: 'PDF' },
  'image/jpeg': { extensions: ['jpg', 'jpeg'], label: 'JPEG' },
  'image/png': { extensions: ['png'], label: 'PNG' },
  'image/webp': { extensions: ['webp'], label: 'WebP' },
  'text/csv': { extensions: ['csv'], label: 'CSV' },
  'text/plain': { extensions: ['txt'], label: 'plain text' },
} as const;

export type EvidenceType = keyof typeof evidenceTypes;

/**
 * The SDK writes sizes as a power of two with a unit; the same limit is checked again on the
 * stored bytes, because the browser's declared size is only a claim.
 */
export type SizeLimit = '4MB' | '8MB' | '16MB';

export type KindRule = {
  label: string;
  hint: string;
  types: readonly EvidenceType[];
  maxSize: SizeLimit;
  /** Files in one upload. */
  maxCount: number;
};

const MiB = 1024 * 1024;
export const sizeLimitBytes: Record<SizeLimit, number> = { '4MB': 4 * MiB, '8MB': 8 * MiB, '16MB': 16 * MiB };

// Only formats a reviewer can open without a special program, and none that a browser would run.
export const kindRules: Record<AttachmentKind, KindRule> = {
  lab_sheet: {
    label: 'Lab sheet',
    hint: 'The laboratory’s result sheet or the instrument’s export: PDF, CSV, text, or a scan as PNG or JPEG.',
    types: ['application/pdf', 'text/csv', 'text/plain', 'image/png', 'image/jpeg'],
    maxSize: '16MB',
    maxCount: 5,
  },
  calibration_certificate: {
    label: 'Calibration certificate',
    hint: 'The certificate of the instrument or of the reference standard: PDF, or a scan as PNG or JPEG.',
    types: ['application/pdf', 'image/png', 'image/jpeg'],
    maxSize: '16MB',
    maxCount: 5,
  },
  photo: {
    label: 'Photo',
    hint: 'Seals, labels, the cool box, the data logger display: JPEG, PNG or WebP.',
    types: ['image/jpeg', 'image/png', 'image/webp'],
    maxSize: '8MB',
    maxCount: 10,
  },
  correspondence: {
    label: 'Correspondence',
    hint: 'Letters and e-mails about the delivery, saved as PDF or text, or a scan as PNG or JPEG.',
    types: ['application/pdf', 'text/plain', 'image/png', 'image/jpeg'],
    maxSize: '16MB',
    maxCount: 5,
  },
  other: {
    label: 'Other',
    hint: 'Anything else the board should see: PDF, CSV, text, JPEG, PNG or WebP.',
    types: ['application/pdf', 'text/csv', 'text/plain', 'image/jpeg', 'image/png', 'image/webp'],
    maxSize: '16MB',
    maxCount: 5,
  },
};

export function isAttachmentKind(value: unknown): value is AttachmentKind {
  return typeof value === 'string' && (attachmentKinds as readonly string[]).includes(value);
}

export function maxBytesOf(kind: AttachmentKind): number {
  return sizeLimitBytes[kindRules[kind].maxSize];
}

/** The lower-case extension of a file name, without the dot; '' when there is none. */
export function extensionOf(fileName: string): string {
  const dot = fileName.lastIndexOf('.');
  return dot > 0 && dot < fileName.length - 1 ? fileName.slice(dot + 1).toLowerCase() : '';
}

/** The accepted type a file name's extension stands for under a kind, if any. */
export function typeForExtension(kind: AttachmentKind, extension: string): EvidenceType | undefined {
  return kindRules[kind].types.find((type) => (evidenceTypes[type].extensions as readonly string[]).includes(extension));
}

/** "PDF, CSV or PNG" for messages and hints. */
export function typeList(kind: AttachmentKind): string {
  const labels = kindRules[kind].types.map((type) => evidenceTypes[type].label);
  return labels.length > 1 ? `${labels.slice(0, -1).join(', ')} or ${labels.at(-1)}` : labels[0];
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < MiB) return `${(bytes / 1024).toFixed(bytes < 10 * 1024 ? 1 : 0)} KiB`;
  const mebibytes = bytes / MiB;
  return `${Number.isInteger(mebibytes) ? mebibytes : mebibytes.toFixed(1)} MiB`;
}
