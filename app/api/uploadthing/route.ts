import { createRouteHandler } from 'uploadthing/server';
import { uploadThingSdkConfig } from '@/lib/upload-service/settings';
import { evidenceRouter } from './core';

export const dynamic = 'force-dynamic';

// The SDK's own handler: GET gives the browser the routes' limits, POST presigns uploads and takes
// the upload service's completion calls (signed with the API key, checked by the SDK). Built on the
// first request, because the settings are validated then and not while `next build` loads the module.
let handler: ((request: Request) => Promise<Response>) | undefined;

function evidenceHandler(request: Request): Promise<Response> {
  handler ??= createRouteHandler({ router: evidenceRouter, config: uploadThingSdkConfig() });
  return handler(request);
}

export { evidenceHandler as GET, evidenceHandler as POST };
