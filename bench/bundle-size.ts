// npm run bench (row "first-load JS"), or alone: tsx bench/bundle-size.ts [distDir] [--json]
//
// First-load JavaScript per page, from the build output (Next 16 with Turbopack prints no sizes). For each
// page, the chunks a browser loads on its first visit: the framework's `rootMainFiles` (build-manifest.json;
// `polyfillFiles` are nomodule scripts modern browsers skip, so they are not counted) plus every chunk the
// page's client-reference manifest (server/app/**/page_client-reference-manifest.js, `entryJSFiles`) lists
// for its entries: the root and nested layouts, the page, and the not-found/forbidden/error boundaries that
// ship with it. Sizes are of the files on disk, raw and gzip-compressed (what `next start` sends). Checked
// against a served page: for /login this is exactly the set of <script src> in its HTML, minus the nomodule
// polyfill.
// Baseline: the framework's own chunks (rootMainFiles); ratio: page / framework.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { gzipSync } from "node:zlib";
import { type BenchReport, type BenchRow, fmt, formatTable, isMain } from "./lib/result";

/** Budget per page, gzip: about what a mid-range phone parses in ~1 s (the commonly used 170 kB min+gz budget). */
export const FIRST_LOAD_BUDGET_BYTES = 170 * 1024;

export interface PageBundle {
  page: string;
  files: string[];
  rawBytes: number;
  gzipBytes: number;
}

function manifestFiles(dir: string): string[] {
  const found: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) found.push(...manifestFiles(full));
    else if (entry.name === "page_client-reference-manifest.js") found.push(full);
  }
  return found;
}

/** Route of a manifest key: "/(app)/scenarios/[id]/page" → "/scenarios/[id]". */
function routeOf(key: string): string {
  const route = key.replace(/\/page$/, "").replace(/\/\([^)]+\)/g, "");
  return route === "" ? "/" : route;
}

export function firstLoadJs(distDir: string): { framework: PageBundle; pages: PageBundle[] } {
  const buildManifest = JSON.parse(readFileSync(path.join(distDir, "build-manifest.json"), "utf8")) as { rootMainFiles: string[] };
  const sizes = new Map<string, { raw: number; gzip: number }>();
  const sizeOf = (file: string) => {
    let size = sizes.get(file);
    if (!size) {
      const bytes = readFileSync(path.join(distDir, file.replace(/^\/_next\//, "")));
      size = { raw: bytes.byteLength, gzip: gzipSync(bytes).byteLength };
      sizes.set(file, size);
    }
    return size;
  };
  const bundle = (page: string, files: string[]): PageBundle => {
    const unique = [...new Set(files.map((file) => file.replace(/^\/_next\//, "")))];
    return {
      page,
      files: unique,
      rawBytes: unique.reduce((sum, file) => sum + sizeOf(file).raw, 0),
      gzipBytes: unique.reduce((sum, file) => sum + sizeOf(file).gzip, 0),
    };
  };
  const framework = bundle("(framework)", buildManifest.rootMainFiles);
  const pages: PageBundle[] = [];
  for (const file of manifestFiles(path.join(distDir, "server", "app"))) {
    const holder = { __RSC_MANIFEST: {} as Record<string, { entryJSFiles?: Record<string, string[]> }> };
    // The manifest is a script assigning globalThis.__RSC_MANIFEST[key]; run it against a local object.
    new Function("globalThis", readFileSync(file, "utf8"))(holder);
    for (const [key, manifest] of Object.entries(holder.__RSC_MANIFEST)) {
      if (/^\/_(global-error|not-found)\//.test(key)) continue;
      const entries = Object.values(manifest.entryJSFiles ?? {}).flat();
      pages.push(bundle(routeOf(key), [...buildManifest.rootMainFiles, ...entries]));
    }
  }
  pages.sort((a, b) => a.page.localeCompare(b.page));
  return { framework, pages };
}

export function bundleRows(distDir: string): BenchRow[] {
  if (!existsSync(path.join(distDir, "build-manifest.json"))) {
    throw new Error(`no build in ${distDir}: run next build first (NEXT_DIST_DIR=${distDir} npx next build)`);
  }
  const { framework, pages } = firstLoadJs(distDir);
  return pages.map((page) => ({
    name: `first-load JS ${page.page}`,
    measured: `${fmt.kb(page.gzipBytes)} gz (${fmt.kb(page.rawBytes)})`,
    target: `≤ ${fmt.kb(FIRST_LOAD_BUDGET_BYTES)} gz`,
    baseline: `framework ${fmt.kb(framework.gzipBytes)} gz`,
    ratio: fmt.times(page.gzipBytes / framework.gzipBytes),
    met: page.gzipBytes <= FIRST_LOAD_BUDGET_BYTES,
  }));
}

if (isMain(import.meta.url)) {
  const distDir = process.argv.slice(2).find((arg) => !arg.startsWith("--")) ?? process.env.NEXT_DIST_DIR ?? ".next";
  const rows = bundleRows(distDir);
  console.log(`first-load JS per page in ${distDir}`);
  console.log(formatTable(rows));
  if (process.argv.includes("--json")) console.log(JSON.stringify({ bench: "bundle-size", rows } satisfies BenchReport));
}
