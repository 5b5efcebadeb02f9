import { checkDatabase } from "@/server/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const db = await checkDatabase();
  if (db.ok) return Response.json({ status: "ok", db: "ok" });
  return Response.json(
    { status: "unavailable", db: "unreachable", error: `The database does not answer: ${db.reason}` },
    { status: 503 },
  );
}
