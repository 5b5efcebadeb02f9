import "server-only";
import { getDatabase } from "@/db/client";

/** Asks PostgreSQL for `select 1`, bounded so a dead database answers quickly. */
export async function checkDatabase(): Promise<{ ok: true } | { ok: false; reason: string }> {
  try {
    const { sql } = getDatabase();
    await Promise.race([
      sql`select 1`,
      new Promise((_, reject) => setTimeout(() => reject(new Error("timed out after 3 s")), 3000)),
    ]);
    return { ok: true };
  } catch (error) {
    return { ok: false, reason: error instanceof Error ? error.message : String(error) };
  }
}
