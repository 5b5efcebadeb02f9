// Where the app under test runs. `npm test` sets these; the defaults match its fixed test ports.
// (E2E_BASE_URL, not BASE_URL: vitest sets BASE_URL to "/" like Vite does.)
export const e2e = {
  /** Use localhost, not 127.0.0.1: Auth.js redirects say localhost (see stack notes, pitfall 5). */
  baseUrl: process.env.E2E_BASE_URL ?? "http://localhost:3100",
  databaseUrl: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54339/tributary",
  smtpHost: process.env.SMTP_HOST ?? "127.0.0.1",
  smtpPort: Number(process.env.SMTP_PORT ?? 2535),
  /** Logs of the processes under test (web.log, mail.log, worker.log, db.log). */
  logDir: process.env.E2E_LOG_DIR ?? ".data-test/logs",
  screenDir: process.env.E2E_SCREEN_DIR ?? ".data-test/screens",
  chromium: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
};

export function url(path: string): string {
  return new URL(path, e2e.baseUrl).toString();
}
