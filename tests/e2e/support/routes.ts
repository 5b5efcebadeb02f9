// Every API route and its HTTP methods, as "METHOD /api/path" (sorted): the route handlers under
// app/api (the methods their route.ts exports) and the Pages Router API routes under pages/api (the
// method each passes to pagesApiRoute). The authorization matrix and the fuzz table check themselves
// against this list, so a new route cannot be added without a line in each.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const httpMethods = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;

export function discoverRoutes(methods: readonly string[] = httpMethods): string[] {
  return [...discoverRouteHandlers(methods, "app/api"), ...discoverPagesApiRoutes(methods, "pages/api")].sort();
}

function discoverRouteHandlers(methods: readonly string[], dir: string): string[] {
  const found: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) found.push(...discoverRouteHandlers(methods, full));
    else if (entry.name === "route.ts") {
      const source = readFileSync(full, "utf8");
      const exported = new Set<string>();
      for (const m of source.matchAll(/export\s+(?:const|let|async\s+function|function)\s+([A-Z]+)\b/g)) exported.add(m[1]);
      for (const m of source.matchAll(/export\s+(?:const\s+)?\{([^}]*)\}/g)) {
        for (const name of m[1].split(",")) exported.add(name.trim().split(/\s+as\s+/).pop()!.trim());
      }
      const route = "/" + path.dirname(full).split(path.sep).join("/").replace(/^app\//, "");
      for (const method of methods) if (exported.has(method)) found.push(`${method} ${route}`);
    }
  }
  return found;
}

function discoverPagesApiRoutes(methods: readonly string[], dir: string): string[] {
  const found: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) found.push(...discoverPagesApiRoutes(methods, full));
    else if (entry.name.endsWith(".ts")) {
      const source = readFileSync(full, "utf8");
      const method = /pagesApiRoute\(\s*"([A-Z]+)"/.exec(source)?.[1];
      const route = "/" + full.slice(0, -".ts".length).split(path.sep).join("/").replace(/^pages\//, "").replace(/\/index$/, "");
      // A file under pages/api that is not a pagesApiRoute skips the shared checks, and one with Next's
      // body parser on leaves pagesApiRoute no body to read: list either so the matrix fails, naming it.
      if (!method) found.push(`NOT A pagesApiRoute ${route}`);
      else if (!/bodyParser:\s*false/.test(source)) found.push(`BODY PARSER ON ${route}`);
      else if (methods.includes(method)) found.push(`${method} ${route}`);
    }
  }
  return found;
}

/** The file that defines a route ("/api/fits/[id]/predict"): its app/api route.ts, else its pages/api file. */
export function routeSourceFile(route: string): string {
  const relative = route.replace(/^\//, "");
  const handler = path.join("app", relative, "route.ts");
  return existsSync(handler) ? handler : path.join("pages", `${relative}.ts`);
}
