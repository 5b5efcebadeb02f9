import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { signInAttempts } from "@/db/schema";
import { checkSignInThrottle, clientAddress, MAX_FAILURES, recordSignInAttempt, throttleMessage } from "@/server/auth/throttle";
import { db, uniq } from "./helpers";

const address = () => `198.51.100.${Math.floor(Math.random() * 250) + 1}-${uniq("ip")}`;

async function fail(email: string, ip: string, times: number) {
  for (let i = 0; i < times; i++) await recordSignInAttempt({ email, ip, ok: false });
}

describe("sign-in throttling", () => {
  it("allows 10 failures for an account and refuses from then on, with the minutes to wait", async () => {
    const email = `${uniq("victim")}@test.example`;
    await fail(email, address(), MAX_FAILURES - 1);
    expect(await checkSignInThrottle({ email, ip: address() })).toMatchObject({ throttled: false, accountFailures: 9 });

    await fail(email, address(), 1);
    const state = await checkSignInThrottle({ email, ip: address() });
    expect(state).toMatchObject({ throttled: true, scope: "account" });
    if (!state.throttled) throw new Error("unreachable");
    expect(state.retryAfterMinutes).toBeGreaterThanOrEqual(14);
    expect(state.retryAfterMinutes).toBeLessThanOrEqual(15);
    expect(throttleMessage(state)).toMatch(/^Too many failed sign-ins for this account; try again in 1[45] minutes\.$/);
  });

  it("counts failures per address across accounts", async () => {
    const ip = address();
    for (let i = 0; i < MAX_FAILURES; i++) await recordSignInAttempt({ email: `${uniq("spray")}@test.example`, ip, ok: false });
    const state = await checkSignInThrottle({ email: `${uniq("fresh")}@test.example`, ip });
    expect(state).toMatchObject({ throttled: true, scope: "address" });
    if (state.throttled) expect(throttleMessage(state)).toMatch(/from this network address/);
  });

  it("forgets failures older than 15 minutes", async () => {
    const email = `${uniq("old")}@test.example`;
    const ip = address();
    await db()
      .insert(signInAttempts)
      .values(Array.from({ length: MAX_FAILURES }, () => ({ email, ip, ok: false, at: sql`now() - interval '16 minutes'` })));
    expect(await checkSignInThrottle({ email, ip })).toMatchObject({ throttled: false, accountFailures: 0, addressFailures: 0 });
  });

  it("says when the limit lifts: when the 10th most recent failure leaves the window", async () => {
    const email = `${uniq("waiting")}@test.example`;
    await db()
      .insert(signInAttempts)
      .values([
        ...Array.from({ length: 9 }, () => ({ email, ip: address(), ok: false })),
        { email, ip: address(), ok: false, at: sql`now() - interval '12 minutes'` },
      ]);
    const state = await checkSignInThrottle({ email, ip: address() });
    expect(state).toMatchObject({ throttled: true, scope: "account", retryAfterMinutes: 3 });
  });

  it("starts counting an account again after a successful sign-in (ten wrong in a row)", async () => {
    const email = `${uniq("forgetful")}@test.example`;
    await fail(email, address(), 9);
    await recordSignInAttempt({ email, ip: address(), ok: true });
    await fail(email, address(), 9);
    expect(await checkSignInThrottle({ email, ip: address() })).toMatchObject({ throttled: false, accountFailures: 9 });
  });

  it("takes the client address from the first x-forwarded-for entry", () => {
    expect(clientAddress(new Headers({ "x-forwarded-for": "203.0.113.9, 10.0.0.1" }))).toBe("203.0.113.9");
    expect(clientAddress(new Headers())).toBe("unknown");
  });
});
