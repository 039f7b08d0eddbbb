import { getAuth } from '@/lib/auth/auth';
import { unusableRedirect } from '@/lib/http/auth-redirects';
import { nulTextRefusal } from '@/lib/http/nul-text';
import { problemResponse } from '@/lib/http/problem';

export const dynamic = 'force-dynamic';

async function handle(request: Request): Promise<Response> {
  const refused = unusableRedirect(request) ?? (await nulTextRefusal(request));
  if (refused) return problemResponse(refused, new URL(request.url).pathname);
  return getAuth().handler(request);
}

export const GET = handle;
export const POST = handle;
