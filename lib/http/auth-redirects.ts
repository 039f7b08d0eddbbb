import { AppError } from '@/lib/errors';

/** Query values better-auth builds a redirect from. */
const REDIRECT_PARAMS = ['callbackURL', 'errorCallbackURL', 'newUserCallbackURL', 'redirectTo'] as const;

const REFERENCE_ORIGIN = 'http://reference.invalid';

/** What better-auth can append its query to: an absolute URL, or a path on this site ("/x", not "//x"). */
export function isUsableRedirect(value: string): boolean {
  if (value === '') return true; // better-auth treats an empty value as none
  if (value.startsWith('/')) {
    if (value.startsWith('//') || value.startsWith('/\\')) return false;
    try {
      return new URL(value, REFERENCE_ORIGIN).origin === REFERENCE_ORIGIN;
    } catch {
      return false;
    }
  }
  return URL.canParse(value);
}

/**
 * better-auth answers a redirect target it cannot parse (" ", "x y") with a 500 when it builds the
 * error redirect. That is the caller's mistake, so it is refused first, as a 400.
 */
export function unusableRedirect(request: Request): AppError | null {
  const query = new URL(request.url).searchParams;
  for (const name of REDIRECT_PARAMS) {
    if (query.getAll(name).some((value) => !isUsableRedirect(value))) {
      return new AppError('invalid', `${name} must be an absolute URL or a path on this site starting with “/”.`, { fieldErrors: { [name]: ['Not a usable address.'] } });
    }
  }
  return null;
}
