import "server-only";

/**
 * One error type for every surface (route handlers, server actions, pages).
 *
 * A code is a type, optionally followed by the surface it concerns: "forbidden", "not_found:fit",
 * "invalid:body". The type decides the HTTP status; the message is shown to the user as is, so
 * write it as a plain sentence and never put secrets in it.
 */
export type ErrorType =
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "invalid"
  | "too_large"
  | "rate_limited"
  | "unavailable"
  | "internal";

export type ErrorCode = ErrorType | `${ErrorType}:${string}`;

/** One problem with the input: `path` is dotted ("terms.0.name"), files add `row` and `column`. */
export type ErrorDetail = {
  path?: string;
  message: string;
  row?: number;
  column?: string;
  [key: string]: unknown;
};

export type ErrorBody = { error: string; details: ErrorDetail[] };

export const statusByErrorType: Record<ErrorType, number> = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

const defaultMessages: Record<ErrorType, string> = {
  unauthenticated: "Sign in first, or send a valid API token in the Authorization header.",
  forbidden: "Your roles in this workspace do not allow this.",
  not_found: "Not found.",
  conflict: "This conflicts with the current state; reload and try again.",
  too_large: "The request is too large.",
  invalid: "The input is not valid.",
  rate_limited: "Too many requests; try again later.",
  internal: "Something went wrong on our side. The error was logged.",
  unavailable: "The database is not answering right now; try again in a moment.",
};

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly type: ErrorType;
  readonly status: number;
  readonly details: ErrorDetail[];
  readonly headers: Record<string, string>;

  constructor(
    code: ErrorCode,
    message?: string,
    options: { details?: ErrorDetail[]; headers?: Record<string, string>; cause?: unknown } = {},
  ) {
    const type = code.split(":")[0] as ErrorType;
    super(message ?? defaultMessages[type], { cause: options.cause });
    this.name = "AppError";
    this.code = code;
    this.type = type;
    this.status = statusByErrorType[type] ?? 500;
    this.details = options.details ?? [];
    this.headers = options.headers ?? {};
  }

  toBody(): ErrorBody {
    return { error: this.message, details: this.details };
  }

  toResponse(): Response {
    return Response.json(this.toBody(), { status: this.status, headers: this.headers });
  }
}

export const isAppError = (error: unknown): error is AppError => error instanceof AppError;

// postgres.js connection failures carry Node's socket codes or its own; SQLSTATE class 08 is
// "connection exception", 57P0x are shutdowns and 53300 is "too many connections".
const connectionCodes = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENOTFOUND",
  "EPIPE",
  "CONNECT_TIMEOUT",
  "CONNECTION_CLOSED",
  "CONNECTION_ENDED",
  "CONNECTION_DESTROYED",
  "57P01",
  "57P02",
  "57P03",
  "53300",
]);

function errorChain(error: unknown): unknown[] {
  const chain: unknown[] = [];
  let current: unknown = error;
  while (current !== null && current !== undefined && chain.length < 8 && !chain.includes(current)) {
    chain.push(current);
    const { cause, errors } = current as { cause?: unknown; errors?: unknown };
    // AggregateError (e.g. ECONNREFUSED on both ::1 and 127.0.0.1) keeps its parts in `errors`.
    current = cause ?? (Array.isArray(errors) ? errors[0] : undefined);
  }
  return chain;
}

function codeOf(error: unknown): string | undefined {
  const code = (error as { code?: unknown } | null)?.code;
  return typeof code === "string" ? code : undefined;
}

/** True when the error (or its cause) means PostgreSQL could not be reached. */
export function isDatabaseUnavailable(error: unknown): boolean {
  return errorChain(error).some((e) => {
    const code = codeOf(e);
    return code !== undefined && (connectionCodes.has(code) || code.startsWith("08"));
  });
}

/** The SQLSTATE of a PostgreSQL error anywhere in the cause chain (drizzle wraps them). */
export function postgresCode(error: unknown): string | undefined {
  for (const e of errorChain(error)) {
    const code = codeOf(e);
    if (code && /^[0-9A-Z]{5}$/.test(code) && (e as { severity?: unknown }).severity !== undefined) return code;
  }
  return undefined;
}

/**
 * A log line that names the failure without leaking data: drizzle's messages embed the query's
 * parameters (hashes, e-mail addresses), and PostgreSQL's `detail` repeats key values, so only the
 * innermost error's name, code and first message line are kept.
 */
export function describeForLog(error: unknown): string {
  const chain = errorChain(error);
  const innermost = chain[chain.length - 1] ?? error;
  if (innermost instanceof Error) {
    const code = codeOf(innermost);
    const firstLine = innermost.message.split("\n")[0].slice(0, 300);
    const where = innermost.stack?.split("\n").slice(1, 4).map((l) => l.trim()).join(" < ") ?? "";
    const safeLine = /^Failed query:/.test(firstLine) ? "query failed" : firstLine;
    return `${innermost.name}${code ? ` ${code}` : ""}: ${safeLine}${where ? ` (${where})` : ""}`;
  }
  return typeof innermost === "string" ? innermost.slice(0, 300) : "non-error value thrown";
}

/**
 * Turns anything thrown into an AppError: AppErrors pass through, an unreachable database becomes
 * 503, a unique-key clash 409; everything else is logged (without data) and becomes a generic 500.
 */
export function toAppError(error: unknown, context = "request"): AppError {
  if (error instanceof AppError) return error;
  if (isDatabaseUnavailable(error)) {
    console.error(`[${context}] database unavailable: ${describeForLog(error)}`);
    return new AppError("unavailable", undefined, { headers: { "Retry-After": "5" } });
  }
  const sqlState = postgresCode(error);
  if (sqlState === "23505") return new AppError("conflict", "This already exists.");
  if (sqlState === "40001" || sqlState === "40P01") {
    return new AppError("conflict", "Someone else changed this at the same time; try again.");
  }
  console.error(`[${context}] unexpected error: ${describeForLog(error)}`);
  return new AppError("internal");
}

/** The JSON response for anything thrown in a route handler. */
export function errorResponse(error: unknown, context?: string): Response {
  return toAppError(error, context).toResponse();
}
