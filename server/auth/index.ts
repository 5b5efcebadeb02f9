import "server-only";
import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { DrizzleAdapter } from "@auth/drizzle-adapter";
import { z } from "zod";
import { getDatabase } from "@/db/client";
import { accounts, sessions, users, verificationTokens } from "@/db/schema";
import { authConfig } from "@/server/auth/config";
import { verifyAgainstDummy, verifyPassword } from "@/server/auth/password";
import { checkSignInThrottle, clientAddress, recordSignInAttempt } from "@/server/auth/throttle";
import { getUserCredentialsByEmail, normalizeEmail } from "@/server/data/users";

/** Thrown from authorize when the account or address is throttled; the sign-in form explains it. */
export class ThrottledSignIn extends CredentialsSignin {
  code = "throttled";
}

const credentialsSchema = z.object({
  email: z.string().trim().toLowerCase().pipe(z.email()),
  password: z.string().min(1).max(200),
});

let adapter: ReturnType<typeof DrizzleAdapter> | undefined;

// A config function (evaluated per request) so that importing this module never opens the pool:
// `next build` loads it without a database.
export const { handlers, auth, signIn, signOut } = NextAuth(() => ({
  ...authConfig,
  adapter: (adapter ??= DrizzleAdapter(getDatabase().db, {
    usersTable: users,
    accountsTable: accounts,
    sessionsTable: sessions,
    verificationTokensTable: verificationTokens,
  })),
  providers: [
    Credentials({
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw, request) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) return null;
        const email = normalizeEmail(parsed.data.email);
        const ip = clientAddress(request.headers);

        // The 11th attempt is refused before the password is even looked at, right or wrong.
        const throttle = await checkSignInThrottle({ email, ip });
        if (throttle.throttled) throw new ThrottledSignIn();

        const user = await getUserCredentialsByEmail(email);
        const ok = user?.passwordHash
          ? await verifyPassword(user.passwordHash, parsed.data.password)
          : await verifyAgainstDummy(parsed.data.password);
        await recordSignInAttempt({ email, ip, ok });
        if (!ok || !user) return null;
        return { id: user.id, email: user.email, name: user.name };
      },
    }),
  ],
}));
