// Seeds the demo company (idempotent: every step creates only what is missing). Run by `npm start`
// after the migrations; by hand: `npm run seed` (DATABASE_URL must point at a migrated database).
import { getDatabase } from "@/db/client";
import { seedDemoFit } from "./demo-fit";
import { seedDemoScenarios } from "./demo-scenarios";
import { seedUsers } from "./users";

type Step = { name: string; run: (db: ReturnType<typeof getDatabase>["db"]) => Promise<unknown> };

// One entry per area, in dependency order.
const steps: Step[] = [
  { name: "workspaces, demo users and roles", run: seedUsers },
  { name: "demo spend history, approved and draft demo fits", run: seedDemoFit },
  { name: "demo scenarios, a comparison and a finance comment", run: seedDemoScenarios },
];

async function main() {
  const { db, sql } = getDatabase();
  try {
    for (const step of steps) {
      const started = Date.now();
      await step.run(db);
      console.log(`seed: ${step.name} (${Date.now() - started} ms)`);
    }
  } finally {
    await sql.end();
  }
}

main().catch((error: unknown) => {
  console.error(`Seeding failed: ${error instanceof Error ? error.message.split("\n")[0] : String(error)}`);
  process.exit(1);
});
