// Auth.js settings shared by the full instance (server/auth/index.ts) and the page proxy (proxy.ts).
// Provider-free and database-free, so the proxy can check the session cookie without touching PostgreSQL.
import type { NextAuthConfig } from "next-auth";

declare module "next-auth" {
  interface Session {
    user: { id: string; email: string; name?: string | null };
  }
}

function describe(error: Error): string {
  // Walk to the innermost cause and keep its name and first line only: causes from the database
  // layer embed query parameters, and credentials must never reach a log.
  let inner: unknown = error;
  for (let depth = 0; depth < 5 && inner && typeof inner === "object" && "cause" in inner && inner.cause; depth++) {
    const cause: unknown = inner.cause;
    inner = typeof cause === "object" && cause && "err" in cause ? (cause as { err: unknown }).err : cause;
  }
  // Auth.js errors carry their kind in `type` (class names are minified in production builds).
  const kind = (e: Error) => (e as { type?: string }).type ?? e.name;
  const line = inner instanceof Error && inner !== error ? `${kind(inner)}: ${inner.message.split("\n")[0]}` : "";
  const own = error.message.split("\n")[0].replace(/\s*Read more at \S+/, "");
  return `${kind(error)}: ${own.slice(0, 200)}${line && !line.includes("Failed query") ? ` (${line.slice(0, 200)})` : ""}`;
}

export const authConfig = {
  trustHost: true,
  session: { strategy: "jwt", maxAge: 7 * 24 * 60 * 60 },
  pages: { signIn: "/login" },
  providers: [],
  callbacks: {
    // Used by proxy.ts: pages in its matcher need a session; everything else decides for itself.
    authorized: ({ auth }) => Boolean(auth?.user),
    jwt({ token, user }) {
      if (user?.id) token.sub = user.id;
      return token;
    },
    session({ session, token }) {
      if (token.sub) session.user.id = token.sub;
      return session;
    },
  },
  logger: {
    error(error) {
      // A wrong password is an expected outcome, not a server error.
      if ((error as { type?: string }).type === "CredentialsSignin") return;
      console.error(`[auth] ${describe(error)}`);
    },
    warn(code) {
      console.warn(`[auth] warning: ${code}`);
    },
    debug() {},
  },
} satisfies NextAuthConfig;
