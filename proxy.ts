// Coarse gate for pages: without a session cookie, go to /login and come back after. Never the only
// check — every page, server action and route handler calls requireActor / requirePageActor, which
// verify the session and read the member's roles.
//
// Only the cookie's presence is checked here, on purpose: Auth.js's own proxy wrapper re-issues the
// session cookie on every matched request, and a prefetch answered after sign-out would put the
// session back.
//
// Also the pages' Content-Security-Policy with a fresh nonce per request: Next reads the nonce from the
// request's CSP header and puts it on its own scripts, so no inline script runs without it. Every page
// here renders per request (they read the session), which nonces need; so does the 404 page
// (app/not-found.tsx opts out of prerendering). Other security headers are in next.config.ts `headers()`.
import { NextResponse, type NextRequest } from "next/server";

const sessionCookie = /^(__Secure-)?authjs\.session-token(\.\d+)?$/;

/** Pages of the signed-in app (prefixes): without a session cookie they redirect to /login. Add new top-level pages here. */
const signedInPages = ["/datasets", "/fits", "/scenarios", "/compare", "/notifications", "/settings", "/api-docs"];
const isSignedInPage = (pathname: string) =>
  pathname === "/" || signedInPages.some((prefix) => pathname === prefix || pathname.startsWith(`${prefix}/`));

function contentSecurityPolicy(nonce: string, https: boolean): string {
  return [
    "default-src 'self'",
    // 'strict-dynamic': scripts the nonce'd bootstrap loads (the page's chunks) are trusted; nothing else.
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'`,
    // React renders style attributes (slider positions, bar widths) in the HTML: they need 'unsafe-inline'.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(https ? ["upgrade-insecure-requests"] : []),
  ].join("; ");
}

export function proxy(request: NextRequest) {
  const path = request.nextUrl.pathname + request.nextUrl.search;
  if (isSignedInPage(request.nextUrl.pathname) && !request.cookies.getAll().some((cookie) => sessionCookie.test(cookie.name))) {
    // A relative callbackUrl: Next reports 127.0.0.1 as localhost, and Auth.js drops foreign hosts.
    const login = new URL("/login", request.nextUrl);
    login.search = new URLSearchParams({ callbackUrl: path }).toString();
    return NextResponse.redirect(login);
  }
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  const nonce = btoa(String.fromCharCode(...bytes));
  const https = request.headers.get("x-forwarded-proto") === "https" || request.nextUrl.protocol === "https:";
  const policy = contentSecurityPolicy(nonce, https);
  const headers = new Headers(request.headers);
  headers.set("x-tributary-path", path); // lets requirePageActor send an expired session back here after sign-in
  headers.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  // Every page (for the CSP); not route handlers under /api/ (they answer 401 themselves), build files or the icon.
  matcher: ["/((?!api/|_next/static/|_next/image|icon\\.svg|favicon\\.ico).*)"],
};
