// The app's cheapest route: a constant answer, used by readiness polls and as the benchmark floor.
export const dynamic = "force-static";

export function GET() {
  return Response.json({ ok: true });
}
