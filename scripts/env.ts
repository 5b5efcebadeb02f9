// The environment of the app's processes: defaults < `.env` < variables set in the calling shell.
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

export type Env = Record<string, string>;

/** Parses a `.env` file: KEY=value lines, `#` comments, optional `export `, optional single/double quotes. */
export function parseDotEnv(text: string): Env {
  const env: Env = {};
  for (const rawLine of text.split(/\r?\n/)) {
    const line = rawLine.trim();
    if (!line || line.startsWith("#")) continue;
    const match = /^(?:export\s+)?([A-Za-z_][A-Za-z0-9_]*)\s*=\s*(.*)$/.exec(line);
    if (!match) continue;
    let value = match[2];
    const quote = value[0];
    if ((quote === '"' || quote === "'") && value.lastIndexOf(quote) > 0) {
      value = value.slice(1, value.lastIndexOf(quote));
      if (quote === '"') value = value.replace(/\\n/g, "\n").replace(/\\"/g, '"');
    } else {
      value = value.replace(/\s+#.*$/, "");
    }
    env[match[1]] = value;
  }
  return env;
}

export function loadDotEnv(file = ".env"): Env {
  return existsSync(file) ? parseDotEnv(readFileSync(file, "utf8")) : {};
}

/** The persistent AUTH_SECRET of this checkout: generated once into `<dataDir>/auth-secret` (never committed). */
export function persistentAuthSecret(dataDir: string): string {
  const file = path.join(dataDir, "auth-secret");
  if (existsSync(file)) {
    const secret = readFileSync(file, "utf8").trim();
    if (secret) return secret;
  }
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return secret;
}

export function randomSecret(): string {
  return randomBytes(32).toString("base64url");
}

export interface EnvInput {
  /** Values used when neither `.env` nor the shell sets them. */
  defaults: Env;
  /** Values that win over everything (the test run pins its ports and its throwaway database). */
  forced?: Env;
  dotEnvFile?: string;
}

/**
 * defaults < .env < shell < forced. APP_URL defaults to http://localhost:$PORT (Auth.js redirects say
 * localhost; see stack notes) and DATABASE_URL to the project-local cluster on $PGPORT.
 */
export function resolveEnv({ defaults, forced = {}, dotEnvFile = ".env" }: EnvInput): Env {
  const merged: Env = { ...defaults, ...loadDotEnv(dotEnvFile) };
  for (const key of Object.keys(merged)) {
    const fromShell = process.env[key];
    if (fromShell !== undefined && fromShell !== "") merged[key] = fromShell;
  }
  Object.assign(merged, forced);
  const explicit = (key: string) => key in forced || process.env[key] || key in loadDotEnv(dotEnvFile);
  if (!explicit("APP_URL")) merged.APP_URL = `http://localhost:${merged.PORT}`;
  if (!explicit("DATABASE_URL")) merged.DATABASE_URL = `postgres://postgres@127.0.0.1:${merged.PGPORT}/tributary`;
  return merged;
}

/** The defaults of `npm start` (see .env.example). */
export function startDefaults(): Env {
  return {
    PORT: "3000",
    PGPORT: "54329",
    DATABASE_URL: "postgres://postgres@127.0.0.1:54329/tributary",
    AUTH_SECRET: "", // filled from <dataDir>/auth-secret when still empty
    AUTH_TRUST_HOST: "true",
    APP_URL: "http://localhost:3000",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: "2525",
    SMTP_USER: "",
    SMTP_PASS: "",
    SMTP_SECURE: "false",
    MAIL_FROM: "Tributary <no-reply@tributary.localhost>",
    MAIL_SINK: "local",
    NEXT_TELEMETRY_DISABLED: "1",
    NEXT_DIST_DIR: ".next",
  };
}
