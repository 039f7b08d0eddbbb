// Below this, gzip's own header and the cost of starting a compressor outweigh what it saves.
const SMALL_BODY_BYTES = 1024;

/**
 * A JSON answer. The server compresses every answer whose client accepts it, whatever its size: it
 * cannot see a route's length, and it drops a stated one. A small answer says "no-transform" in
 * its Cache-Control, which the compressor honours, so a 150-byte problem is sent as it is.
 */
export function jsonResponse(body: unknown, init: { status?: number; headers?: HeadersInit } = {}): Response {
  const text = JSON.stringify(body);
  const headers = new Headers(init.headers);
  if (!headers.has('content-type')) headers.set('content-type', 'application/json');
  if (Buffer.byteLength(text) < SMALL_BODY_BYTES) {
    const cacheControl = headers.get('cache-control');
    headers.set('cache-control', cacheControl ? `${cacheControl}, no-transform` : 'no-transform');
  }
  return new Response(text, { status: init.status ?? 200, headers });
}
