/**
 * Which link targets a note may carry: http, https, mailto, or a link within this site. Anything
 * else (javascript:, data:, vbscript:, file:, …) could run script or fetch something unexpected.
 */
const allowedSchemes = new Set(['http', 'https', 'mailto']);

// Browsers drop tabs and newlines anywhere in a URL and trim control characters and spaces at both
// ends, so "java\tscript:" and " JaVaScRiPt:" mean javascript: to them; the check must see what they see.
function asBrowsersReadIt(href: string): string {
  return href.replace(/[\t\n\r]/g, '').replace(/^[\u0000-\u0020]+|[\u0000-\u0020]+$/g, '');
}

/** The href as it is to be stored, or null if a note may not link there. */
export function safeHref(raw: unknown): string | null {
  if (typeof raw !== 'string') return null;
  const href = asBrowsersReadIt(raw);
  if (href.length === 0 || href.length > 2000) return null;
  // Any other control character, or a backslash (which browsers read as a slash), has no place in a link.
  if (/[\u0000-\u001f\u007f\\]/.test(href)) return null;
  const scheme = /^([a-zA-Z][a-zA-Z0-9+.-]*):/.exec(href);
  if (scheme) {
    if (!allowedSchemes.has(scheme[1].toLowerCase())) return null;
    if (scheme[1].toLowerCase() === 'mailto') return /^mailto:[^\s]+@[^\s]+$/i.test(href) ? href : null;
    try {
      const url = new URL(href);
      return url.hostname ? href : null;
    } catch {
      return null;
    }
  }
  // Relative: a path on this site, a query or a fragment. "//host" would leave the site, and a colon
  // anywhere makes the link's meaning depend on how a reader decodes it ("&#106;avascript:").
  if (href.startsWith('//') || href.includes(':')) return null;
  return href;
}

export function isSafeHref(raw: unknown): boolean {
  return safeHref(raw) !== null;
}
