// Formatting for spend-history screens (the number helpers of ui/fits/format.ts cover values in units).

/**
 * Bytes as people read them: "812 bytes", "42 KB", "42.3 MB" (no decimals from 100 up). Units of 1024,
 * as the server's size limit ("200 MB") and most file managers count.
 */
export function formatBytes(bytes: number, locale = "en"): string {
  if (!Number.isFinite(bytes) || bytes < 0) return "—";
  if (bytes < 1024) return `${bytes.toLocaleString(locale)} ${bytes === 1 ? "byte" : "bytes"}`;
  const units = ["KB", "MB", "GB"];
  let value = bytes / 1024;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  const digits = value >= 100 ? 0 : 1;
  return `${value.toLocaleString(locale, { maximumFractionDigits: digits, minimumFractionDigits: digits })} ${units[unit]}`;
}

/** "42 MB of 100 MB", using the larger number's unit for both so the two read alike. */
export function formatBytesOf(done: number, total: number, locale = "en"): string {
  const [kb, mb, gb] = [1024, 1024 ** 2, 1024 ** 3];
  const scale = total >= gb ? gb : total >= mb ? mb : total >= kb ? kb : 1;
  const unit = scale === gb ? "GB" : scale === mb ? "MB" : scale === kb ? "KB" : "bytes";
  const digits = scale === 1 || total / scale >= 100 ? 0 : 1;
  const fmt = (n: number) => (n / scale).toLocaleString(locale, { maximumFractionDigits: digits, minimumFractionDigits: digits });
  return `${fmt(done)} ${unit} of ${fmt(total)} ${unit}`;
}

export const roleLabels = {
  outcome: "Outcome",
  spend: "Spend channel",
  control: "Control",
  period: "Period",
  ignored: "Ignored",
} as const;

export type ColumnRoleName = keyof typeof roleLabels;
