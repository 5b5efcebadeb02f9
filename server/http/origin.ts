import "server-only";
import { headers } from "next/headers";

/**
 * The address people use to reach the app, for links in e-mails: APP_URL when set (behind a proxy
 * or in production), else the scheme and host of the current request.
 */
export async function appOrigin(): Promise<string> {
  const configured = process.env.APP_URL ?? process.env.AUTH_URL;
  if (configured) return new URL(configured).origin;
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host") ?? "localhost:3000";
  const proto = h.get("x-forwarded-proto")?.split(",")[0] ?? "http";
  return `${proto}://${host}`;
}
