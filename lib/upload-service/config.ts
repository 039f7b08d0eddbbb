// Settings that point the UploadThing SDKs at a service. Pure: no server, no I/O, safe to import anywhere.

export type UploadThingTokenParts = { apiKey: string; appId: string; regions: string[]; ingestHost?: string };

/** The SDK's token: base64 of `{ apiKey, appId, regions, ingestHost? }`. */
export function uploadThingToken(o: { apiKey: string; appId: string; region?: string; ingestHost?: string }): string {
  const parts: UploadThingTokenParts = { apiKey: o.apiKey, appId: o.appId, regions: [o.region ?? 'local'], ...(o.ingestHost ? { ingestHost: o.ingestHost } : {}) };
  return Buffer.from(JSON.stringify(parts), 'utf8').toString('base64');
}

/** Reads a token back; throws an Error that says what is wrong with it. */
export function decodeUploadThingToken(token: string): UploadThingTokenParts {
  let parsed: unknown;
  try {
    parsed = JSON.parse(Buffer.from(token.trim(), 'base64').toString('utf8'));
  } catch {
    throw new Error('is not base64 of a JSON object');
  }
  const t = parsed as Partial<UploadThingTokenParts> | null;
  if (!t || typeof t !== 'object') throw new Error('is not base64 of a JSON object');
  if (typeof t.apiKey !== 'string' || !t.apiKey.startsWith('sk_')) throw new Error('has no apiKey starting with "sk_"');
  if (typeof t.appId !== 'string' || t.appId === '') throw new Error('has no appId');
  if (!Array.isArray(t.regions) || t.regions.length === 0 || !t.regions.every((r) => typeof r === 'string')) throw new Error('has no regions');
  if (t.ingestHost !== undefined && typeof t.ingestHost !== 'string') throw new Error('has an ingestHost that is not a string');
  return { apiKey: t.apiKey, appId: t.appId, regions: t.regions, ...(t.ingestHost ? { ingestHost: t.ingestHost } : {}) };
}

/**
 * Every UPLOADTHING_* variable the app and the SDK need to talk to a service at `origin`
 * (the local one, or any other that speaks the same protocol).
 */
export function uploadThingEnv(o: { origin: string; apiKey: string; appId: string; callbackUrl?: string; isDev?: boolean }): Record<string, string> {
  const origin = new URL(o.origin);
  // The SDK builds signed file URLs itself and picks http only when the host contains "local".
  if (origin.protocol === 'http:' && !origin.host.includes('local')) {
    throw new Error(`An http upload service must be addressed as localhost, not ${origin.host}: the SDK would sign https file URLs for it.`);
  }
  const base = origin.origin;
  return {
    UPLOADTHING_TOKEN: uploadThingToken({ apiKey: o.apiKey, appId: o.appId }),
    UPLOADTHING_INGEST_URL: base,
    UPLOADTHING_API_URL: base,
    UPLOADTHING_UFS_HOST: origin.host,
    // No wildcard DNS on a laptop: the app id goes into the path (`/a/<appId>/<key>`), not a subdomain.
    UPLOADTHING_UFS_APP_ID_LOCATION: 'path',
    UPLOADTHING_IS_DEV: String(o.isDev ?? false),
    UPLOADTHING_LOG_LEVEL: 'Warning',
    ...(o.callbackUrl ? { UPLOADTHING_CALLBACK_URL: o.callbackUrl } : {}),
  };
}
