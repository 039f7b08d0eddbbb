import { withoutActor } from '@/lib/http/api';
import { openApiDocument } from '@/lib/openapi/document';

export const dynamic = 'force-dynamic';

let body: string | undefined;

/** The API's OpenAPI 3.1 document; public, so tools can read the contract before anyone signs in. */
export const GET = withoutActor(async () => {
  // The document only changes with a deployment: serialise it once per server process.
  body ??= JSON.stringify(openApiDocument());
  return new Response(body, {
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'public, max-age=300' },
  });
});
