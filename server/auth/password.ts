import "server-only";
import { hash, verify } from "@node-rs/argon2";
import { z } from "zod";

// argon2id (the library's default algorithm) with OWASP's suggested minimum: 19 MiB, 2 passes, 1 lane.
const argon2Options = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export const PASSWORD_MIN_LENGTH = 10;

/** Rules for a new password; sign-in only checks that one was given. */
export const newPasswordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(200, "Use at most 200 characters.");

/** An argon2id PHC string ("$argon2id$v=19$m=19456,t=2,p=1$…"). */
export function hashPassword(password: string): Promise<string> {
  return hash(password, argon2Options);
}

/** False for a wrong password and for a malformed stored hash; never throws on bad input. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | undefined;

/**
 * Spends the same time as a real verification when the account does not exist, so response times
 * do not reveal which e-mail addresses have accounts. Always resolves to false.
 */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword("dummy password that no account has");
  await verifyPassword(await dummyHash, password);
  return false;
}
