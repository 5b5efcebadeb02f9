// npm run bench (rows "slider → redrawn interval"), or alone against a running app:
//     BASE_URL=http://localhost:3000 DATABASE_URL=postgres://postgres@127.0.0.1:54329/tributary \
//       tsx bench/slider-latency.ts [--json]
//
// In Debian's chromium (playwright-core, headless): the planner signs in, a scenario is started on the
// approved demo fit, and the allocation slider is moved with the keyboard MOVES times (default 120; ≥ 100),
// cycling over the channels (5 steps up each, then 5 down…) so that plans rarely repeat. Each move waits
// for its redraw. The page sets performance marks: `allocation-input` when the store takes a move
// (ui/stores/allocation-store.ts) and `interval-redrawn` when the outcome interval's drawing changed
// (ui/scenario/outcome-interval.tsx, a layout effect, i.e. the DOM is updated). Latency of a move = first
// `interval-redrawn` at or after its `allocation-input` − that input. Also reported: the same to the next
// frame after the redraw (requestAnimationFrame, then a task: roughly when it is on screen), and over 10
// isolated moves the time until the server's confirmed value (`prediction-confirmed`, debounce included).
// Prints figures; asserts nothing.
import { chromium, type Page } from "playwright-core";
import { CHROMIUM_ARGS } from "../tests/e2e/support/browser";
import { approvedFitId, createToken, database, revokeTokens, startScenario } from "./lib/app";
import { type BenchReport, type BenchRow, fmt, formatTable, isMain, notMeasured, percentile } from "./lib/result";

const MOVES = Math.max(100, Number(process.env.MOVES ?? 120));
const TARGET_P95_MS = 50;
const TARGET_CONFIRM_MS = 300;
const TOKEN_NAME = "bench:slider";

async function waitForServerValue(page: Page): Promise<void> {
  await page.locator('[data-testid="outcome-panel"][data-source="server"]').waitFor({ timeout: 30_000 });
}

export async function sliderLatency(options: { baseUrl: string; databaseUrl: string; chromiumPath?: string }): Promise<BenchRow[]> {
  const executablePath = options.chromiumPath ?? process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
  const sql = database(options.databaseUrl);
  const browser = await chromium.launch({ executablePath, headless: true, args: CHROMIUM_ARGS });
  try {
    const token = await createToken(sql, "planner@larkspur.example", TOKEN_NAME);
    const scenario = await startScenario(options.baseUrl.replace("//localhost", "//127.0.0.1"), token, await approvedFitId(sql), `Slider benchmark ${new Date().toISOString()}`);
    const context = await browser.newContext({ baseURL: options.baseUrl, viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await page.goto("/login");
    await page.getByLabel("E-mail").fill("planner@larkspur.example");
    await page.getByLabel("Password").fill("larkspur-planner");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((url) => url.pathname === "/", { timeout: 30_000 });
    await page.goto(`/scenarios/${scenario.id}`);
    await waitForServerValue(page);

    // A mark one frame (rAF, then a task) after each redraw: roughly when the new drawing is on screen.
    await page.evaluate(() => {
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) {
          if (entry.name !== "interval-redrawn") continue;
          requestAnimationFrame(() => {
            const channel = new MessageChannel();
            channel.port1.onmessage = () => performance.mark("bench-frame-after-redraw");
            channel.port2.postMessage(null);
          });
        }
      }).observe({ entryTypes: ["mark"] });
      performance.clearMarks();
    });

    const sliders = page.getByRole("slider");
    const channelCount = await sliders.count();
    if (channelCount === 0) throw new Error("the scenario page shows no sliders");
    const redraw: number[] = [];
    const frame: number[] = [];
    let noRedraw = 0;
    for (let move = 0; move < MOVES; move++) {
      const channel = move % channelCount;
      const key = Math.floor(move / (channelCount * 5)) % 2 === 0 ? "ArrowRight" : "ArrowLeft";
      const slider = sliders.nth(channel);
      if (await slider.isDisabled()) continue;
      await slider.focus();
      const before = await page.evaluate(() => performance.getEntriesByName("allocation-input").length);
      await page.keyboard.press(key);
      const measured = await page
        .waitForFunction(
          (count) => {
            const inputs = performance.getEntriesByName("allocation-input");
            if (inputs.length <= count) return null;
            const start = inputs[inputs.length - 1].startTime;
            const drawn = performance.getEntriesByName("interval-redrawn").find((entry) => entry.startTime >= start);
            const shown = performance.getEntriesByName("bench-frame-after-redraw").find((entry) => entry.startTime >= start);
            return drawn && shown ? { redraw: drawn.startTime - start, frame: shown.startTime - start } : null;
          },
          before,
          { timeout: 3_000, polling: 5 },
        )
        .then((handle) => handle.jsonValue())
        .catch(() => null);
      if (measured) {
        redraw.push(measured.redraw);
        frame.push(measured.frame);
      } else noRedraw += 1; // the store refused the move (a bound) or nothing changed on screen
    }

    // Server follow-up: isolated moves, each waiting for the confirmed value.
    const confirm: number[] = [];
    for (let move = 0; move < 10; move++) {
      await waitForServerValue(page);
      const slider = sliders.nth(move % channelCount);
      await slider.focus();
      await page.evaluate(() => performance.clearMarks());
      await page.keyboard.press(move % 2 === 0 ? "PageUp" : "PageDown");
      const follow = await page
        .waitForFunction(
          () => {
            const input = performance.getEntriesByName("allocation-input").at(-1)?.startTime;
            const done = performance.getEntriesByName("prediction-confirmed").find((entry) => input !== undefined && entry.startTime >= input);
            return input !== undefined && done ? done.startTime - input : null;
          },
          undefined,
          { timeout: 10_000, polling: 10 },
        )
        .then((handle) => handle.jsonValue())
        .catch(() => null);
      if (follow !== null) confirm.push(follow);
    }
    await context.close();

    const caveat = noRedraw > 0 ? `${noRedraw} of ${MOVES} moves changed nothing on screen (a bound stopped them) and are not counted` : undefined;
    return [
      {
        name: `slider → redrawn interval p95 (${redraw.length} moves)`,
        measured: fmt.ms(percentile(redraw, 95)),
        target: `≤ ${TARGET_P95_MS} ms`,
        baseline: "",
        ratio: "",
        met: redraw.length >= 100 ? percentile(redraw, 95) <= TARGET_P95_MS : null,
        note: redraw.length >= 100 ? caveat : `only ${redraw.length} moves redrew; ${caveat ?? ""}`,
      },
      {
        name: "slider → redrawn interval p50",
        measured: fmt.ms(percentile(redraw, 50)),
        target: "",
        baseline: "",
        ratio: "",
        met: null,
      },
      {
        name: "slider → next frame after redraw p95",
        measured: fmt.ms(percentile(frame, 95)),
        target: "",
        baseline: "",
        ratio: "",
        met: null,
      },
      confirm.length > 0
        ? {
            name: `slider → server's confirmed value p95 (${confirm.length} moves)`,
            measured: fmt.ms(percentile(confirm, 95)),
            target: `≤ ${TARGET_CONFIRM_MS} ms`,
            baseline: "",
            ratio: "",
            met: percentile(confirm, 95) <= TARGET_CONFIRM_MS,
            note: `includes the 120 ms debounce; p50 ${fmt.ms(percentile(confirm, 50))}`,
          }
        : notMeasured("slider → server's confirmed value", `≤ ${TARGET_CONFIRM_MS} ms`, "no confirmation arrived within 10 s"),
    ];
  } finally {
    await browser.close().catch(() => {});
    await revokeTokens(sql, TOKEN_NAME).catch(() => {});
    await sql.end();
  }
}

if (isMain(import.meta.url)) {
  const baseUrl = (process.env.BASE_URL ?? "http://localhost:3000").replace("//127.0.0.1", "//localhost");
  const databaseUrl = process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tributary";
  sliderLatency({ baseUrl, databaseUrl }).then(
    (rows) => {
      console.log(formatTable(rows));
      if (process.argv.includes("--json")) console.log(JSON.stringify({ bench: "slider-latency", rows } satisfies BenchReport));
    },
    (error: unknown) => {
      console.error(`slider-latency failed: ${error instanceof Error ? error.stack : String(error)}`);
      process.exit(1);
    },
  );
}
