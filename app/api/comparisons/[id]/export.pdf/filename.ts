/** A Content-Disposition value with an ASCII fallback name and the UTF-8 one (RFC 6266). */
export function attachmentName(title: string, extension: "csv" | "pdf"): string {
  const base = `side-by-side-${title}`.slice(0, 120);
  const ascii = base.normalize("NFKD").replace(/[^\w.-]+/g, "-").replace(/-+/g, "-").replace(/^-|-$/g, "") || "comparison";
  return `attachment; filename="${ascii}.${extension}"; filename*=UTF-8''${encodeURIComponent(`${base}.${extension}`)}`;
}
