/**
 * The uploader's words for a failed upload. The route's own refusals arrive as messages we wrote; a
 * transport failure (the file store or the app not answering) arrives as the SDK's technical text,
 * which is replaced by what it means for the user.
 */
export const STORE_UNREACHABLE =
  'The file store could not be reached, so nothing was saved. Try again in a few minutes; if it keeps failing, tell your administrator.';

const TECHNICAL = [/^Failed to report event/i, /^XHR failed/i, /^Failed to parse response/i, /^Something went wrong/i, /^UPLOAD_FAILED$/, /^INTERNAL_CLIENT_ERROR$/, /fetch failed/i, /Failed to fetch/i, /NetworkError/i];

export function uploadErrorMessage(error: { code?: string; message?: string } | null | undefined): string {
  const message = error?.message?.trim() ?? '';
  if (!message || error?.code === 'INTERNAL_CLIENT_ERROR' || error?.code === 'UPLOAD_FAILED' || TECHNICAL.some((pattern) => pattern.test(message))) {
    return STORE_UNREACHABLE;
  }
  if (error?.code === 'INTERNAL_SERVER_ERROR' || error?.code === 'INVALID_SERVER_CONFIG' || error?.code === 'MISSING_ENV') {
    return 'The upload could not be prepared on our side, so nothing was saved. Try again; if it keeps failing, tell your administrator.';
  }
  if (/^Invalid config/i.test(message)) {
    return 'Your browser reports a file type this kind of evidence does not take, or too many files at once; nothing was uploaded. Check the files and the kind chosen.';
  }
  return message;
}
