/**
 * Canonical JSON: object keys sorted, no whitespace, numbers in JavaScript's shortest round-trip
 * form — so the same record always serialises to the same bytes and its checksum is stable.
 * In the spirit of RFC 8785 (JSON Canonicalization Scheme), whose number format is ECMAScript's.
 *
 * @throws for values JSON cannot carry exactly: non-finite numbers, undefined inside arrays,
 *   functions, typed arrays (convert them to plain arrays first)
 */
export function canonicalJson(value: unknown): string {
  if (value === null) return "null";
  switch (typeof value) {
    case "number":
      if (!Number.isFinite(value)) throw new Error(`canonicalJson requires finite numbers (got ${value})`);
      return JSON.stringify(value);
    case "string":
    case "boolean":
      return JSON.stringify(value);
    case "object": {
      if (Array.isArray(value)) {
        return `[${value.map((item) => {
          if (item === undefined) throw new Error("canonicalJson requires arrays without undefined entries");
          return canonicalJson(item);
        }).join(",")}]`;
      }
      if (ArrayBuffer.isView(value)) throw new Error("canonicalJson requires plain arrays, not typed arrays");
      const entries = Object.entries(value as Record<string, unknown>)
        .filter(([, item]) => item !== undefined)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${entries.map(([key, item]) => `${JSON.stringify(key)}:${canonicalJson(item)}`).join(",")}}`;
    }
    default:
      throw new Error(`canonicalJson cannot represent a ${typeof value}`);
  }
}
