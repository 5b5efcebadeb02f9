import "server-only";
import { and, count, desc, eq, gt, lt, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { signInAttempts } from "@/db/schema";

/** At most this many failed sign-ins per account, and per address, within the window. */
export const MAX_FAILURES = 10;
export const WINDOW_MINUTES = 15;

export type ThrottleState =
  | { throttled: false; accountFailures: number; addressFailures: number }
  | { throttled: true; scope: "account" | "address"; retryAfterMinutes: number };

const windowStart = sql`now() - make_interval(mins => ${WINDOW_MINUTES})`;

/**
 * Failed attempts counted for an account start after its last successful sign-in (so the limit is
 * "10 wrong passwords in a row"); for an address, every failure in the window counts.
 */
async function failuresSince(column: "email" | "ip", value: string) {
  const key = column === "email" ? signInAttempts.email : signInAttempts.ip;
  const since =
    column === "email"
      ? sql`greatest(${windowStart}, coalesce((select max(${signInAttempts.at}) from ${signInAttempts} where ${signInAttempts.email} = ${value} and ${signInAttempts.ok}), '-infinity'::timestamptz))`
      : windowStart;
  const failures = and(eq(key, value), eq(signInAttempts.ok, false), gt(signInAttempts.at, since));
  const [{ n }] = await db.select({ n: count() }).from(signInAttempts).where(failures);
  if (n < MAX_FAILURES) return { n, retryAfterMinutes: 0 };
  // The limit lifts when the MAX_FAILURES-th most recent failure leaves the window.
  const [oldestCounted] = await db
    .select({
      seconds: sql<number>`extract(epoch from (${signInAttempts.at} + make_interval(mins => ${WINDOW_MINUTES}) - now()))::float8`,
    })
    .from(signInAttempts)
    .where(failures)
    .orderBy(desc(signInAttempts.at))
    .offset(MAX_FAILURES - 1)
    .limit(1);
  return { n, retryAfterMinutes: Math.max(1, Math.ceil((oldestCounted?.seconds ?? 60) / 60)) };
}

export async function checkSignInThrottle(input: { email: string; ip: string }): Promise<ThrottleState> {
  const [account, address] = await Promise.all([failuresSince("email", input.email), failuresSince("ip", input.ip)]);
  if (account.n >= MAX_FAILURES) return { throttled: true, scope: "account", retryAfterMinutes: account.retryAfterMinutes };
  if (address.n >= MAX_FAILURES) return { throttled: true, scope: "address", retryAfterMinutes: address.retryAfterMinutes };
  return { throttled: false, accountFailures: account.n, addressFailures: address.n };
}

export async function recordSignInAttempt(input: { email: string; ip: string; ok: boolean }): Promise<void> {
  await db.insert(signInAttempts).values(input);
  // Keep the table small: rows older than a day no longer matter to any window.
  if (Math.random() < 0.02) {
    await db.delete(signInAttempts).where(lt(signInAttempts.at, sql`now() - interval '1 day'`));
  }
}

export function throttleMessage(state: Extract<ThrottleState, { throttled: true }>): string {
  const minutes = `${state.retryAfterMinutes} minute${state.retryAfterMinutes === 1 ? "" : "s"}`;
  return state.scope === "account"
    ? `Too many failed sign-ins for this account; try again in ${minutes}.`
    : `Too many failed sign-ins from this network address; try again in ${minutes}.`;
}

/**
 * The client's address as the web server saw it. Next sets x-forwarded-for to the socket address
 * when no proxy did; behind a proxy the first entry is the client.
 */
export function clientAddress(headers: Headers): string {
  const forwarded = headers.get("x-forwarded-for")?.split(",")[0]?.trim();
  return (forwarded || headers.get("x-real-ip") || "unknown").slice(0, 64);
}
