// Fixtures for the dataset integration tests: a fresh workspace and uploader per test, a snapshot of
// every table (row count and a hash of the rows) to prove that a failed upload changed nothing.
import { randomBytes } from "node:crypto";
import { getDatabase } from "@/db/client";
import { users, workspaces } from "@/db/schema";

const uniq = (label: string) => `${label}-${randomBytes(4).toString("hex")}`;

export async function makeUploader() {
  const { db } = getDatabase();
  const slug = uniq("ds");
  const [workspace] = await db.insert(workspaces).values({ name: `Datasets ${slug}`, slug }).returning();
  const [user] = await db
    .insert(users)
    .values({ email: `${uniq("analyst")}@test.example`, name: "Ana Lyst" })
    .returning({ id: users.id });
  return { workspaceId: workspace.id, userId: user.id };
}

/** Every table of every schema (pg-boss's included): its row count and a hash of its rows. */
export async function snapshotAllTables(): Promise<Record<string, string>> {
  const { sql } = getDatabase();
  const tables = await sql<{ name: string }[]>`
    select quote_ident(table_schema) || '.' || quote_ident(table_name) as name
    from information_schema.tables
    where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema')
    order by 1`;
  const out: Record<string, string> = {};
  for (const { name } of tables) {
    const [row] = await sql.unsafe<{ n: number; h: string }[]>(
      `select count(*)::int as n, coalesce(sum(hashtext(t::text)::bigint), 0)::text as h from ${name} t`,
    );
    out[name] = `${row.n} rows, hash ${row.h}`;
  }
  return out;
}

/** Connections of this database left idle inside a transaction (a leaked COPY or transaction). */
export async function idleInTransaction(): Promise<number> {
  const { sql } = getDatabase();
  const [row] = await sql<{ n: number }[]>`
    select count(*)::int as n from pg_stat_activity
    where datname = current_database() and state like 'idle in transaction%' and pid <> pg_backend_pid()`;
  return row.n;
}
