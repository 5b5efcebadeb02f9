import "server-only";
import { appOrigin } from "@/server/http/origin";

/** An absolute link for an e-mail: APP_URL (or the request's origin) + an app path. */
export async function absoluteLink(path: string): Promise<string> {
  let origin: string;
  try {
    origin = await appOrigin();
  } catch {
    // Outside a request (worker, seed, tests, scripts) there are no headers to read.
    origin = process.env.APP_URL ? new URL(process.env.APP_URL).origin : "http://localhost:3000";
  }
  return `${origin}${path}`;
}
