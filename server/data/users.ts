import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { users } from "@/db/schema";
import { hashPassword } from "@/server/auth/password";
import type { DbExecutor } from "@/server/data/audit";

export type UserDto = { id: string; email: string; name: string | null };

const userColumns = { id: users.id, email: users.email, name: users.name };

/** E-mail addresses are compared and stored trimmed and lower-cased. */
export const normalizeEmail = (email: string) => email.trim().toLowerCase();

export async function getUserById(id: string): Promise<UserDto | null> {
  const [row] = await db.select(userColumns).from(users).where(eq(users.id, id));
  return row ?? null;
}

export async function getUserByEmail(email: string, tx: DbExecutor = db): Promise<UserDto | null> {
  const [row] = await tx.select(userColumns).from(users).where(eq(users.email, normalizeEmail(email)));
  return row ?? null;
}

/** Only for password verification in server/auth; never hand the hash to anything else. */
export async function getUserCredentialsByEmail(email: string) {
  const [row] = await db
    .select({ ...userColumns, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.email, normalizeEmail(email)));
  return row ?? null;
}

export async function createUser(
  input: { email: string; name: string; password: string },
  tx: DbExecutor = db,
): Promise<UserDto> {
  const passwordHash = await hashPassword(input.password);
  const [row] = await tx
    .insert(users)
    .values({ email: normalizeEmail(input.email), name: input.name.trim(), passwordHash })
    .returning(userColumns);
  return row;
}

/**
 * Creates the user unless the e-mail exists; an existing user is returned unchanged (its password
 * included), so the seed can run on every start without undoing what people changed.
 */
export async function ensureUser(input: { email: string; name: string; password: string }): Promise<UserDto> {
  const existing = await getUserByEmail(input.email);
  if (existing) return existing;
  const passwordHash = await hashPassword(input.password);
  await db
    .insert(users)
    .values({ email: normalizeEmail(input.email), name: input.name, passwordHash })
    .onConflictDoNothing({ target: users.email });
  return (await getUserByEmail(input.email))!;
}
