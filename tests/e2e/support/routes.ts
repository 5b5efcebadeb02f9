// Every route handler under app/api and the HTTP methods its route.ts exports, as "METHOD /api/path"
// (sorted). The authorization matrix and the fuzz table check themselves against this list, so a new
// route cannot be added without a line in each.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const httpMethods = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;

export function discoverRoutes(methods: readonly string[] = httpMethods, dir = "app/api"): string[] {
  const found: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) found.push(...discoverRoutes(methods, full));
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
  return found.sort();
}
