import { createRouteHandler } from 'uploadthing/server';
import { uploadThingSdkConfig } from '@/lib/upload-service/settings';
import { tooDeepJson } from '@/lib/http/json-depth';
import { problemResponse } from '@/lib/http/problem';
import { evidenceRouter } from './core';

export const dynamic = 'force-dynamic';

// The SDK's own handler: GET gives the browser the routes' limits, POST presigns uploads and takes
// the upload service's completion calls (signed with the API key, checked by the SDK). Built on the
// first request, because the settings are validated then and not while `next build` loads the module.
let handler: ((request: Request) => Promise<Response>) | undefined;

async function evidenceHandler(request: Request): Promise<Response> {
  // The SDK answers absurdly nested JSON with a 500; refused here as the caller's mistake.
  const refused = request.method === 'POST' ? await tooDeepJson(request) : null;
  if (refused) return problemResponse(refused, new URL(request.url).pathname);
  handler ??= createRouteHandler({ router: evidenceRouter, config: uploadThingSdkConfig() });
  return handler(request);
}

export { evidenceHandler as GET, evidenceHandler as POST };
