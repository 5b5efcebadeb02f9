import "server-only";

/** A Content-Disposition for a download: an ASCII fallback name plus the exact name (RFC 6266 / 5987). */
export function attachment(filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\;]/g, "_") || "download.csv";
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}
