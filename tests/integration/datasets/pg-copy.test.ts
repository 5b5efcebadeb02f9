// COPY FROM STDIN through postgres.js: a COPY the server fails after CopyDone must not hang (postgres.js
// 3.4.9 never settles the writable then, porsager/postgres#1173), and the transaction must roll back.
import { describe, expect, it } from "vitest";
import { getDatabase } from "@/db/client";
import { copyFrom, endCopy, openTransaction } from "@/server/datasets/pg-copy";
import { idleInTransaction } from "./helpers";

describe("COPY helpers", () => {
  it("report a COPY the server refuses after the data was sent, and roll back", async () => {
    const { sql } = getDatabase();
    await sql`create table if not exists copy_probe (n int primary key check (n < 1000))`;
    try {
      const transaction = await openTransaction(sql);
      await transaction.tx`insert into copy_probe values (1)`;
      const stream = await copyFrom(transaction.tx, "copy copy_probe (n) from stdin");
      const lines = Array.from({ length: 2000 }, (_, i) => `${i + 2}\n`).join("");
      const outcome = await Promise.race([
        endCopy(transaction.tx, stream, [Buffer.from(lines)]).then(
          () => "completed",
          (error: Error) => `failed: ${error.message}`,
        ),
        new Promise((resolve) => setTimeout(() => resolve("hung"), 10_000)),
      ]);
      expect(outcome).toMatch(/^failed: (COPY failed on the server|.*violates check constraint)/);
      await transaction.rollback();
      expect((await sql`select count(*)::int as n from copy_probe`)[0].n).toBe(0);
      expect(await idleInTransaction()).toBe(0);
    } finally {
      await sql`drop table if exists copy_probe`;
    }
  });

  it("commit what a successful COPY wrote", async () => {
    const { sql } = getDatabase();
    await sql`create table if not exists copy_probe_ok (n int primary key)`;
    try {
      const transaction = await openTransaction(sql);
      const stream = await copyFrom(transaction.tx, "copy copy_probe_ok (n) from stdin");
      await endCopy(transaction.tx, stream, [Buffer.from("1\n2\n"), Buffer.from("3\n")]);
      await transaction.commit();
      expect((await sql`select count(*)::int as n from copy_probe_ok`)[0].n).toBe(3);
    } finally {
      await sql`drop table if exists copy_probe_ok`;
    }
  });
});
