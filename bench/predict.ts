// npm run bench:predict — load on POST /api/fits/{id}/predict (token-authenticated, a stored
// approved fit) and, in the same run, on the app's cheapest route GET /api/ping (a constant answer,
// the framework's floor). Prints requests/s, p50/p99 latency and the predict/ping ratio. Asserts
// nothing (the machine is shared); it reports whether the targets were met.
//
// It starts nothing. Against the app of `npm start` (127.0.0.1:3000, database 127.0.0.1:54329):
//     npm start                      # in another terminal, wait for "ready"
//     npm run bench:predict
// Against another app: BASE_URL=http://127.0.0.1:3100 DATABASE_URL=postgres://…/tributary npm run bench:predict
//
// Also GET /api/me with the same token, for reference: a dynamic route (no static cache) with the same
// authentication and a near-constant answer, i.e. what any authenticated route costs in this framework.
//
// Options (environment): CONNECTIONS (10), DURATION seconds per round (10), ROUNDS (2: the routes
// alternate so that drift on a shared machine hits all), TARGET_RATIO (0.9), TARGET_P99_MS (25).
// The planner's token is written straight into the database (like the tokens page would) and
// revoked at the end.
import { createHash, randomBytes } from "node:crypto";
import { createRequire } from "node:module";
import path from "node:path";
import postgres from "postgres";
import { describePlanShape } from "@/server/predict/plan-shape";
import { parseFitRecord } from "@/server/stats";
import { PREDICT_P99_TARGET_MS, slowFloorNote } from "./lib/floor-note";

const baseUrl = (process.env.BASE_URL ?? "http://127.0.0.1:3000").replace("//localhost", "//127.0.0.1").replace(/\/$/, "");
const databaseUrl = process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tributary";
const connections = Number(process.env.CONNECTIONS ?? 10);
const duration = Number(process.env.DURATION ?? 10);
const rounds = Number(process.env.ROUNDS ?? 2);
const targetRatio = Number(process.env.TARGET_RATIO ?? 0.9);
const targetP99 = Number(process.env.TARGET_P99_MS ?? PREDICT_P99_TARGET_MS);
const plannerEmail = process.env.PLANNER_EMAIL ?? "planner@larkspur.example";

// autocannon ships no types: the little of its API used here.
type Histogram = { p50: number; p99: number };
type Result = { requests: { total: number }; duration: number; latency: Histogram; non2xx: number; errors: number; timeouts: number };
type RequestSpec = { method?: string; path?: string; headers?: Record<string, string>; body?: string; setupRequest?: (request: RequestSpec) => RequestSpec };
type Options = { url: string; connections: number; duration: number; requests?: RequestSpec[] };
const autocannon = createRequire(path.join(process.cwd(), "package.json"))("autocannon") as (
  options: Options,
  done: (error: Error | null, result: Result) => void,
) => unknown;

function run(options: Options): Promise<Result> {
  return new Promise((resolve, reject) => {
    autocannon(options, (error, result) => (error ? reject(error) : resolve(result)));
  });
}

async function reachable(): Promise<boolean> {
  try {
    return (await fetch(`${baseUrl}/api/ping`)).ok;
  } catch {
    return false;
  }
}

function summary(results: Result[]) {
  const requests = results.reduce((sum, result) => sum + result.requests.total, 0);
  const seconds = results.reduce((sum, result) => sum + result.duration, 0);
  const weighted = (pick: (result: Result) => number) => results.reduce((sum, result) => sum + pick(result) * result.requests.total, 0) / Math.max(1, requests);
  return {
    requestsPerSecond: requests / seconds,
    p50: weighted((result) => result.latency.p50),
    // The worst round's p99: conservative when rounds differ.
    p99: Math.max(...results.map((result) => result.latency.p99)),
    non2xx: results.reduce((sum, result) => sum + result.non2xx + result.errors + result.timeouts, 0),
    requests,
  };
}

async function main() {
  if (!(await reachable())) {
    console.error(`No app answers at ${baseUrl}/api/ping.
Start one first (this script starts nothing):
    npm start                                   # then: npm run bench:predict
or point at a running app and its database:
    BASE_URL=http://127.0.0.1:3100 DATABASE_URL=postgres://postgres@127.0.0.1:54339/tributary npm run bench:predict`);
    process.exit(1);
  }
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  let tokenId: string | null = null;
  try {
    const [fit] = await sql<{ id: string; name: string; record: unknown }[]>`
      select f.id, f.name, f.record from fits f
      join memberships m on m.workspace_id = f.workspace_id join "user" u on u.id = m.user_id
      where u.email = ${plannerEmail} and f.status = 'approved' order by f.approved_at limit 1`;
    if (!fit) throw new Error(`No approved fit in ${plannerEmail}'s workspace: seed the demo fit first.`);
    const token = `trib_${randomBytes(32).toString("base64url")}`;
    const [row] = await sql<{ id: string }[]>`
      insert into api_tokens (workspace_id, user_id, name, token_hash, prefix)
      select m.workspace_id, m.user_id, ${"bench:predict"}, ${createHash("sha256").update(token).digest("hex")}, ${token.slice(0, 9)}
      from memberships m join "user" u on u.id = m.user_id join fits f on f.workspace_id = m.workspace_id
      where u.email = ${plannerEmail} and f.id = ${fit.id} returning id`;
    tokenId = row.id;

    // Plans near the middle of the observed ranges, 13 weeks; every request a different plan (no cache can help).
    const record = parseFitRecord(fit.record);
    const shape = describePlanShape(record);
    let sequence = 0;
    const nextBody = () => {
      sequence += 1;
      return JSON.stringify({
        allocation: Object.fromEntries(
          shape.channels.map((channel, index) => [
            channel.name,
            Math.round(((channel.observed.minimum + channel.observed.maximum) / 2) * 13 * (0.8 + ((sequence * (index + 7)) % 400) / 1000)) + (sequence % 100) / 100,
          ]),
        ),
        controls: Object.fromEntries(shape.controls.map((control) => [control.name, control.kind === "count" ? sequence % 5 : control.observed.minimum])),
        horizon: 13,
        level: 0.95,
      });
    };
    const path = `/api/fits/${fit.id}/predict`;
    const headers = { authorization: `Bearer ${token}`, "content-type": "application/json" };
    const check = await fetch(`${baseUrl}${path}`, { method: "POST", headers, body: nextBody() });
    const answer = (await check.json()) as { horizonTotal?: { mean: number }; error?: string };
    if (!check.ok || !answer.horizonTotal) throw new Error(`The predict route answered ${check.status}: ${answer.error ?? JSON.stringify(answer).slice(0, 200)}`);

    const predictOptions: Options = {
      url: baseUrl,
      connections,
      duration,
      requests: [{ method: "POST", path, headers, setupRequest: (request) => ({ ...request, body: nextBody() }) }],
    };
    const pingOptions: Options = { url: `${baseUrl}/api/ping`, connections, duration };
    // For reference: a dynamic route with the same token authentication and a near-constant answer.
    const meOptions: Options = { url: baseUrl, connections, duration, requests: [{ method: "GET", path: "/api/me", headers: { authorization: `Bearer ${token}` } }] };

    console.log(`bench:predict — ${baseUrl}, fit "${fit.name}" (${shape.channels.length} channels), ${connections} connections, ${rounds} × ${duration} s per route`);
    // Warm-up: JIT, the fit cache and the token cache.
    await run({ ...pingOptions, duration: 2 });
    await run({ ...predictOptions, duration: 2 });
    await run({ ...meOptions, duration: 1 });

    const ping: Result[] = [];
    const predict: Result[] = [];
    const me: Result[] = [];
    for (let round = 0; round < rounds; round++) {
      ping.push(await run(pingOptions));
      predict.push(await run(predictOptions));
      me.push(await run(meOptions));
    }
    const floor = summary(ping);
    const measured = summary(predict);
    const dynamicFloor = summary(me);
    const ratio = measured.requestsPerSecond / floor.requestsPerSecond;
    const line = (name: string, s: ReturnType<typeof summary>) =>
      `${name.padEnd(34)} ${s.requestsPerSecond.toFixed(0).padStart(7)} req/s   p50 ${s.p50.toFixed(1).padStart(5)} ms   p99 ${s.p99.toFixed(1).padStart(5)} ms   ${s.requests} requests, ${s.non2xx} not 2xx`;
    console.log(line("GET /api/ping (constant)", floor));
    console.log(line("POST /api/fits/{id}/predict", measured));
    console.log(line("GET /api/me (dynamic, same token)", dynamicFloor));
    console.log(`ratio predict/ping throughput: ${(ratio * 100).toFixed(1)}%   (predict/me: ${((measured.requestsPerSecond / dynamicFloor.requestsPerSecond) * 100).toFixed(1)}%)`);
    const ratioOk = ratio >= targetRatio;
    const p99Ok = measured.p99 <= targetP99;
    console.log(
      `targets: ≥ ${(targetRatio * 100).toFixed(0)}% of ping throughput ${ratioOk ? "met" : "NOT met"}; p99 ≤ ${targetP99} ms ${p99Ok ? "met" : "NOT met"} (load generator and server share the machine)`,
    );
    const floorNote = slowFloorNote(floor, targetP99);
    if (floorNote) console.log(`note: ${floorNote}`);
    if (measured.non2xx > 0) console.log(`warning: ${measured.non2xx} predict responses were not 2xx`);
    // `--json`: one machine-readable line for `npm run bench` (bench/index.ts).
    if (process.argv.includes("--json")) console.log(JSON.stringify({ connections, duration, rounds, ping: floor, predict: measured, me: dynamicFloor, ratio }));
  } finally {
    if (tokenId) await sql`update api_tokens set revoked_at = now() where id = ${tokenId}`;
    await sql.end();
  }
}

main().catch((error: unknown) => {
  console.error(`bench:predict failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
