// Which upload service the app talks to, from the validated settings: the hosted one when
// UPLOADTHING_TOKEN is set, otherwise the local one with its development credentials.
import { EnvError, LOCAL_UPLOAD_API_KEY, LOCAL_UPLOAD_APP_ID, env, type Env } from '../env';
import { decodeUploadThingToken, uploadThingEnv } from './config';

export type UploadThingSettings = {
  /** True when the configured ingest URL is this machine's upload service. */
  local: boolean;
  /** The port the local service must listen on; null for a hosted service. */
  servicePort: number | null;
  apiKey: string;
  appId: string;
  /** The UPLOADTHING_* variables for the app process and the SDK. */
  vars: Record<string, string>;
};

/** The SDK's log levels (Effect's); lib/env.ts validates the setting against the same list. */
type SdkLogLevel = 'All' | 'Fatal' | 'Error' | 'Warning' | 'Info' | 'Debug' | 'Trace' | 'None';

const EXPLICIT = [
  'UPLOADTHING_TOKEN',
  'UPLOADTHING_INGEST_URL',
  'UPLOADTHING_API_URL',
  'UPLOADTHING_UFS_HOST',
  'UPLOADTHING_UFS_APP_ID_LOCATION',
  'UPLOADTHING_IS_DEV',
  'UPLOADTHING_CALLBACK_URL',
  'UPLOADTHING_LOG_LEVEL',
] as const;

function isLoopback(url: string | undefined): boolean {
  if (!url) return false;
  const host = new URL(url).hostname;
  return host === 'localhost' || host.endsWith('.localhost') || host === '127.0.0.1' || host === '[::1]';
}

export function uploadThingSettings(settings: Env = env()): UploadThingSettings {
  const explicit = Object.fromEntries(EXPLICIT.flatMap((name) => (settings[name] === undefined ? [] : [[name, String(settings[name])]])));
  if (settings.UPLOADTHING_TOKEN) {
    const { apiKey, appId } = decodeUploadThingToken(settings.UPLOADTHING_TOKEN);
    const ingest = settings.UPLOADTHING_INGEST_URL;
    const local = isLoopback(ingest);
    return { local, servicePort: local && ingest ? Number(new URL(ingest).port || 80) : null, apiKey, appId, vars: explicit };
  }
  if (settings.APP_ENV === 'production') {
    throw new EnvError(['UPLOADTHING_TOKEN: must be set in production (the local upload service and its development key are for development, demo and tests)']);
  }
  const local = uploadThingEnv({
    origin: `http://localhost:${settings.UPLOAD_SERVICE_PORT}`,
    apiKey: LOCAL_UPLOAD_API_KEY,
    appId: LOCAL_UPLOAD_APP_ID,
    callbackUrl: `${settings.BETTER_AUTH_URL.replace(/\/$/, '')}/api/uploadthing`,
  });
  return { local: true, servicePort: settings.UPLOAD_SERVICE_PORT, apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID, vars: { ...local, ...explicit } };
}

/**
 * The same settings as SDK options (`createRouteHandler({ config })`, `new UTApi(options)`), for a
 * process whose environment does not carry the UPLOADTHING_* variables itself.
 */
export function uploadThingSdkConfig(settings: Env = env()) {
  const { vars } = uploadThingSettings(settings);
  return {
    token: vars.UPLOADTHING_TOKEN,
    ...(vars.UPLOADTHING_INGEST_URL ? { ingestUrl: vars.UPLOADTHING_INGEST_URL } : {}),
    ...(vars.UPLOADTHING_API_URL ? { apiUrl: vars.UPLOADTHING_API_URL } : {}),
    ...(vars.UPLOADTHING_UFS_HOST ? { ufsHost: vars.UPLOADTHING_UFS_HOST } : {}),
    ...(vars.UPLOADTHING_UFS_APP_ID_LOCATION ? { ufsAppIdLocation: vars.UPLOADTHING_UFS_APP_ID_LOCATION as 'subdomain' | 'path' } : {}),
    ...(vars.UPLOADTHING_CALLBACK_URL ? { callbackUrl: vars.UPLOADTHING_CALLBACK_URL } : {}),
    ...(vars.UPLOADTHING_IS_DEV ? { isDev: vars.UPLOADTHING_IS_DEV === 'true' } : {}),
    ...(vars.UPLOADTHING_LOG_LEVEL ? { logLevel: vars.UPLOADTHING_LOG_LEVEL as SdkLogLevel } : {}),
  };
}
