import "server-only";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "./schema";

export type Database = ReturnType<typeof createDatabase>;

function createDatabase(url: string) {
  const sql = postgres(url, {
    max: Number(process.env.DATABASE_POOL_SIZE ?? 10),
    onnotice: () => {},
    // Fail fast when the database is down so requests get a clear 503 instead of hanging.
    connect_timeout: 5,
    idle_timeout: 30,
  });
  return { sql, db: drizzle(sql, { schema }) };
}

const globalForDb = globalThis as unknown as { tributaryDb?: Database };

function databaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set (see .env.example)");
  return url;
}

/** The one database connection pool of this process (cached across hot reloads in development). */
export function getDatabase(): Database {
  if (!globalForDb.tributaryDb) globalForDb.tributaryDb = createDatabase(databaseUrl());
  return globalForDb.tributaryDb;
}

export const db = new Proxy({} as Database["db"], {
  get: (_target, property) => Reflect.get(getDatabase().db, property),
});
