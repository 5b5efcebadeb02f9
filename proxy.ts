// Coarse gate for pages: without a session cookie, go to /login and come back after. Never the only
// check — every page, server action and route handler calls requireActor / requirePageActor itself.
import NextAuth from "next-auth";
import { NextResponse } from "next/server";
import { authConfig } from "@/server/auth/config";

const { auth } = NextAuth(authConfig);

export const proxy = auth((request) => {
  const path = request.nextUrl.pathname + request.nextUrl.search;
  if (!request.auth?.user) {
    // A relative callbackUrl: Next reports 127.0.0.1 as localhost, and Auth.js drops foreign hosts.
    const login = new URL("/login", request.nextUrl);
    login.search = new URLSearchParams({ callbackUrl: path }).toString();
    return NextResponse.redirect(login);
  }
  const headers = new Headers(request.headers);
  headers.set("x-tributary-path", path); // lets requirePageActor send a stale session back here after sign-in
  return NextResponse.next({ request: { headers } });
});

export const config = {
  // Pages of the signed-in app only: not /login, /invite, /api (route handlers answer 401 themselves) or assets.
  matcher: ["/", "/datasets/:path*", "/fits/:path*", "/scenarios/:path*", "/compare/:path*", "/settings/:path*"],
};
