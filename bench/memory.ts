// npm run bench (row "server RSS under load"), or alone against a running app whose web server's process
// group leader is WEB_PID:
//     BASE_URL=http://127.0.0.1:3000 DATABASE_URL=postgres://…/tributary WEB_PID=<pid> tsx bench/memory.ts [--json]
//
// Resident memory of the web server (every process in its process group, read from /proc) while autocannon
// (CONNECTIONS, default 10) runs DURATION seconds (default 30) of a mix as Sam (analyst + planner):
// POST /api/fits/{id}/predict with a new plan per request, GET /api/datasets/{id}/rows (a page of the demo
// history), GET /api/me (token), and the rendered pages / and /scenarios/{id} (session cookie). Sampled
// every 250 ms. Baseline: the RSS after one warm-up request of each kind and 2 s of rest; also reported:
// the RSS 5 s after the load stops. Prints figures; asserts nothing.
import { createRequire } from "node:module";
import path from "node:path";
import { groupRss } from "./lib/stack";
import { approvedFitId, cookieHeader, createToken, database, revokeTokens, signInWithPassword, startScenario } from "./lib/app";
import { type BenchReport, type BenchRow, fmt, formatTable, isMain } from "./lib/result";

/** Budget for the web server's resident memory under this load (2-core, 24 GB machines; several apps share one). */
export const RSS_BUDGET_BYTES = 512 * 1024 * 1024;
const TOKEN_NAME = "bench:memory";

type RequestSpec = { method?: string; path?: string; headers?: Record<string, string>; body?: string; setupRequest?: (request: RequestSpec) => RequestSpec };
type Result = { requests: { total: number }; non2xx: number; errors: number; timeouts: number; "2xx": number };
const autocannon = createRequire(path.join(process.cwd(), "package.json"))("autocannon") as (
  options: { url: string; connections: number; duration: number; requests: RequestSpec[] },
  done: (error: Error | null, result: Result) => void,
) => unknown;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export async function memoryUnderLoad(options: { baseUrl: string; databaseUrl: string; webPid: number; duration?: number; connections?: number }): Promise<BenchRow[]> {
  const duration = options.duration ?? Number(process.env.DURATION ?? 30);
  const connections = options.connections ?? Number(process.env.CONNECTIONS ?? 10);
  const baseUrl = options.baseUrl.replace("//localhost", "//127.0.0.1");
  const sql = database(options.databaseUrl);
  try {
    const token = await createToken(sql, "sam@larkspur.example", TOKEN_NAME);
    const fitId = await approvedFitId(sql);
    const [dataset] = await sql<{ id: string }[]>`
      select d.id from datasets d join workspaces w on w.id = d.workspace_id where w.slug = 'larkspur' order by d.uploaded_at limit 1`;
    const scenario = await startScenario(baseUrl, token, fitId, `Memory benchmark ${new Date().toISOString()}`);
    const { jar } = await signInWithPassword(baseUrl, "sam@larkspur.example", "larkspur-sam");
    const cookie = cookieHeader(jar);
    const bearer = { authorization: `Bearer ${token}` };
    let sequence = 0;
    const plan = () => {
      sequence += 1;
      const allocation = Object.fromEntries(
        Object.entries(scenario.baseline.allocation).map(([name, amount], index) => [name, Math.round(amount * (0.8 + ((sequence * (index + 7)) % 400) / 1000))]),
      );
      return JSON.stringify({ allocation, controls: scenario.baseline.controls, horizon: scenario.baseline.horizon });
    };
    const requests: RequestSpec[] = [
      { method: "POST", path: `/api/fits/${fitId}/predict`, headers: { ...bearer, "content-type": "application/json" }, setupRequest: (request) => ({ ...request, body: plan() }) },
      ...(dataset ? [{ method: "GET", path: `/api/datasets/${dataset.id}/rows?limit=200`, headers: bearer }] : []),
      { method: "GET", path: "/api/me", headers: bearer },
      { method: "GET", path: "/", headers: { cookie } },
      { method: "GET", path: `/scenarios/${scenario.id}`, headers: { cookie } },
    ];
    for (const request of requests) {
      const response = await fetch(`${baseUrl}${request.path}`, {
        method: request.method,
        headers: request.headers,
        body: request.setupRequest ? request.setupRequest(request).body : undefined,
        redirect: "manual",
      });
      await response.arrayBuffer();
      if (response.status !== 200) throw new Error(`warm-up ${request.method} ${request.path} answered ${response.status}`);
    }
    await sleep(2000);
    const idle = groupRss(options.webPid);

    let peak = idle;
    const sampler = setInterval(() => {
      peak = Math.max(peak, groupRss(options.webPid));
    }, 250);
    const result = await new Promise<Result>((resolve, reject) => {
      autocannon({ url: baseUrl, connections, duration, requests }, (error, value) => (error ? reject(error) : resolve(value)));
    });
    clearInterval(sampler);
    peak = Math.max(peak, groupRss(options.webPid));
    await sleep(5000);
    const after = groupRss(options.webPid);
    const failures = result.non2xx + result.errors + result.timeouts;
    return [
      {
        name: `server RSS under load (peak; ${connections} conn × ${duration} s, mixed API + pages)`,
        measured: fmt.mb(peak),
        target: `≤ ${fmt.mb(RSS_BUDGET_BYTES)}`,
        baseline: `idle ${fmt.mb(idle)}`,
        ratio: fmt.times(peak / idle),
        met: peak <= RSS_BUDGET_BYTES,
        note: `${fmt.int(result.requests.total)} requests (${fmt.int(result.requests.total / duration)}/s), ${failures} not 2xx; RSS 5 s after the load: ${fmt.mb(after)}`,
      },
    ];
  } finally {
    await revokeTokens(sql, TOKEN_NAME).catch(() => {});
    await sql.end();
  }
}

if (isMain(import.meta.url)) {
  const webPid = Number(process.env.WEB_PID);
  if (!webPid) {
    console.error("Set WEB_PID to the web server's pid (its process group leader), e.g. WEB_PID=$(pgrep -f 'next start' | head -1)");
    process.exit(1);
  }
  memoryUnderLoad({ baseUrl: process.env.BASE_URL ?? "http://127.0.0.1:3000", databaseUrl: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tributary", webPid }).then(
    (rows) => {
      console.log(formatTable(rows));
      if (process.argv.includes("--json")) console.log(JSON.stringify({ bench: "memory", rows } satisfies BenchReport));
    },
    (error: unknown) => {
      console.error(`memory failed: ${error instanceof Error ? error.stack : String(error)}`);
      process.exit(1);
    },
  );
}
