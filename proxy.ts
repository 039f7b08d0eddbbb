import { NextResponse, type NextRequest } from 'next/server';
import { getSessionCookie } from 'better-auth/cookies';

// An early redirect for visitors with no session cookie at all. It proves nothing: every page,
// action and route checks the session again on the server.
export function proxy(request: NextRequest) {
  if (!getSessionCookie(request)) {
    const url = new URL('/sign-in', request.url);
    url.searchParams.set('next', request.nextUrl.pathname);
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = {
  matcher: ['/desk/:path*', '/cases/:path*', '/method/:path*', '/rules/:path*', '/deliveries/:path*', '/admin/:path*', '/account/:path*', '/outbox/:path*'],
};
