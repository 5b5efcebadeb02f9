// Coarse gate for pages: without a session cookie, go to /login and come back after. Never the only
// check — every page, server action and route handler calls requireActor / requirePageActor, which
// verify the session and read the member's roles.
//
// Only the cookie's presence is checked here, on purpose: Auth.js's own proxy wrapper re-issues the
// session cookie on every matched request, and a prefetch answered after sign-out would put the
// session back.
import { NextResponse, type NextRequest } from "next/server";

const sessionCookie = /^(__Secure-)?authjs\.session-token(\.\d+)?$/;

export function proxy(request: NextRequest) {
  const path = request.nextUrl.pathname + request.nextUrl.search;
  if (!request.cookies.getAll().some((cookie) => sessionCookie.test(cookie.name))) {
    // A relative callbackUrl: Next reports 127.0.0.1 as localhost, and Auth.js drops foreign hosts.
    const login = new URL("/login", request.nextUrl);
    login.search = new URLSearchParams({ callbackUrl: path }).toString();
    return NextResponse.redirect(login);
  }
  const headers = new Headers(request.headers);
  headers.set("x-tributary-path", path); // lets requirePageActor send an expired session back here after sign-in
  return NextResponse.next({ request: { headers } });
}

export const config = {
  // Pages of the signed-in app only: not /login, /invite, /api (route handlers answer 401 themselves) or assets.
  matcher: ["/", "/datasets/:path*", "/fits/:path*", "/scenarios/:path*", "/compare/:path*", "/notifications/:path*", "/settings/:path*", "/api-docs/:path*"],
};
