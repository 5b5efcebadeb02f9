import { defineConfig } from "drizzle-kit";

// drizzle-kit does not read .env; the default matches scripts/pg.sh's local cluster.
export default defineConfig({
  schema: "./db/schema/index.ts",
  out: "./db/migrations",
  dialect: "postgresql",
  dbCredentials: { url: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tributary" },
  strict: true,
});
