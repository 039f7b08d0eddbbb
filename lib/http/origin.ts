/** Where a change came from, for the audit trail: the channel and the client address if known. */
export function requestOrigin(headers: Headers, channel: 'web' | 'api' | 'job'): string {
  const forwarded = headers.get('x-forwarded-for')?.split(',')[0]?.trim();
  const address = forwarded || headers.get('x-real-ip') || 'unknown address';
  return `${channel} ${address}`.slice(0, 200);
}
