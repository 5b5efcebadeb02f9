import { describe, expect, it } from "vitest";
import { hashPassword, newPasswordSchema, verifyAgainstDummy, verifyPassword } from "@/server/auth/password";

describe("password hashing", () => {
  it("stores an argon2id PHC string, never the password", async () => {
    const hash = await hashPassword("a long enough secret");
    expect(hash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
    expect(hash).not.toContain("a long enough secret");
  });

  it("salts every hash, so the same password hashes differently", async () => {
    expect(await hashPassword("same password twice")).not.toBe(await hashPassword("same password twice"));
  });

  it("verifies the right password and refuses a wrong one", async () => {
    const hash = await hashPassword("right password 123");
    expect(await verifyPassword(hash, "right password 123")).toBe(true);
    expect(await verifyPassword(hash, "right password 124")).toBe(false);
    expect(await verifyPassword(hash, "")).toBe(false);
  });

  it("answers false, without throwing, for a malformed stored hash", async () => {
    expect(await verifyPassword("not a hash", "anything")).toBe(false);
  });

  it("spends a real verification when the account is missing and always refuses", async () => {
    const started = performance.now();
    expect(await verifyAgainstDummy("whatever")).toBe(false);
    expect(await verifyAgainstDummy("dummy password that no account has")).toBe(false);
    expect(performance.now() - started).toBeGreaterThan(5);
  });

  it("asks new passwords for at least 10 characters", () => {
    expect(newPasswordSchema.safeParse("short").success).toBe(false);
    expect(newPasswordSchema.safeParse("long enough").success).toBe(true);
  });
});
