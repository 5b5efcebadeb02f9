// What the later seed steps look up from the earlier ones: the demo workspace and the demo people.
import { eq } from "drizzle-orm";
import type { Database } from "@/db/client";
import { users, workspaces } from "@/db/schema";

type Db = Database["db"];

export async function demoWorkspaceId(db: Db, slug = "larkspur"): Promise<string> {
  const [workspace] = await db.select({ id: workspaces.id }).from(workspaces).where(eq(workspaces.slug, slug));
  if (!workspace) throw new Error(`seed: the ${slug} workspace is missing (run the users step first)`);
  return workspace.id;
}

export async function userIdByEmail(db: Db, email: string): Promise<string> {
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (!row) throw new Error(`seed: demo user ${email} is missing (run the users step first)`);
  return row.id;
}
