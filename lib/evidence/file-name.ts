/**
 * The name a file of evidence is shown and downloaded under. The storage key never comes from it,
 * but the name reaches Content-Disposition headers, the audit trail and other parties' screens.
 *
 * Refused outright: a folder path or a `..` segment (a browser sends the bare name, so a path means a
 * crafted request) and Unicode direction overrides (they make `sheet‮fdp.exe` read as `sheetexe.pdf`).
 * Cleaned quietly: other control characters, characters that are not allowed in file names on common
 * systems, runs of white space, leading dots (hidden files) and lengths past 120 characters.
 */
export type FileNameResult = { ok: true; name: string } | { ok: false; reason: string };

const MAX_NAME_CHARS = 120;

// Bidirectional embeddings, overrides and isolates.
const DIRECTION_CONTROLS = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C]/;
// C0 and C1 controls, DEL, zero-width characters and the byte-order mark.
const INVISIBLE = /[\u0000-\u001F\u007F-\u009F\u200B-\u200D\u2060\uFEFF]/g;
const RESERVED = /[<>:"|?*]/g;

export function cleanFileName(raw: string): FileNameResult {
  if (typeof raw !== 'string' || raw.length === 0) return { ok: false, reason: 'The file has no name.' };
  if (/[/\\]/.test(raw) || raw.trim() === '.' || raw.trim() === '..') {
    return { ok: false, reason: 'The file name contains a folder path; choose the file itself.' };
  }
  if (DIRECTION_CONTROLS.test(raw)) {
    return { ok: false, reason: 'The file name contains invisible characters that reverse the text direction; rename the file.' };
  }
  let name = raw.normalize('NFC').replace(/[\t\r\n]/g, ' ').replace(INVISIBLE, '').replace(RESERVED, '_').replace(/\s+/g, ' ').trim();
  name = name.replace(/^[.\s]+/, '').replace(/[.\s]+$/, '');
  if (!name) return { ok: false, reason: 'The file name is empty once invisible characters are removed; rename the file.' };
  if (name.length > MAX_NAME_CHARS) {
    const dot = name.lastIndexOf('.');
    const extension = dot > 0 && name.length - dot <= 10 ? name.slice(dot) : '';
    name = `${name.slice(0, MAX_NAME_CHARS - extension.length).trimEnd()}${extension}`;
  }
  return { ok: true, name };
}
