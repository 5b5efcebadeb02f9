import "server-only";
import { z } from "zod";
import { AppError, toAppError, type ErrorDetail } from "@/server/errors";
import { requireActor, requirePermission, type Actor, type SessionReader } from "@/server/authz/actor";
import type { Permission } from "@/server/authz/roles";

// The steps every API route takes, whichever of Next's routers calls it: authentication (401),
// permission (403), path parameters (404), body size (413), JSON body and query validation (422),
// and anything thrown turned into the standard error body. server/http/route.ts adapts it to App
// Router route handlers (web Request/Response), server/http/pages-route.ts to a Pages Router API
// route (Node's request and response), used only where that router's lower cost per request matters.

/** Default limit for JSON bodies; uploads set their own (`maxBodyBytes`) or stream the request themselves. */
export const DEFAULT_MAX_BODY_BYTES = 1_000_000;

export type Schema = z.ZodType;
export type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

export type ApiRouteOptions<B extends Schema | undefined, Q extends Schema | undefined, P extends Schema | undefined> = {
  /** The permission the caller needs (403 otherwise). Omit to allow any member of the workspace. */
  permission?: Permission;
  /** `false` for the rare public route: then `actor` is null. Default: a signed-in member or a valid token. */
  auth?: boolean;
  /** zod schema of the JSON body; a mismatch is 422 with one detail per problem. */
  body?: B;
  /** zod schema of the query string (values are strings; use z.coerce for numbers); 422 on mismatch. */
  query?: Q;
  /** zod schema of the path parameters; a mismatch is 404 (an id that cannot exist is not found). */
  params?: P;
  /** Largest accepted body in bytes (413 beyond it). Default 1 MB. */
  maxBodyBytes?: number;
};

/** What every handler receives, from either router. */
export type ApiCoreContext<B, Q, P, A extends boolean | undefined> = {
  actor: A extends false ? null : Actor;
  body: Out<B>;
  query: Out<Q>;
  params: P extends z.ZodType ? z.output<P> : Record<string, string | string[] | undefined>;
};

/** A route's own code: return a Response, or any value to send as JSON with status 200. */
export type ApiHandler<Ctx> = (context: Ctx) => Promise<Response | object | null> | Response | object | null;

/** One incoming request as the pipeline needs it, whatever the router hands over. */
export type ApiInput = {
  method: string;
  /** Path and query string, e.g. "/api/fits/…/predict?x=1". */
  url: string;
  headers: Headers;
  params: Record<string, string | string[] | undefined>;
  /** Reads the whole body as UTF-8 text, refusing (413) beyond `limit` bytes. */
  readBody: (limit: number) => Promise<string>;
  /** How this router reads the Auth.js session (the App Router's default needs no help). */
  readSession?: SessionReader;
};

/** A handler's own Response, or a JSON answer not yet serialized (each router writes it its own way). */
export type ApiOutcome = { response: Response } | { status: number; data: unknown; headers?: Record<string, string> };

export function zodDetails(error: z.ZodError, prefix?: string): ErrorDetail[] {
  return error.issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].filter((part) => part !== undefined && part !== "").join("."),
    message: issue.message,
  }));
}

export const tooLargeError = (limit: number) =>
  new AppError("too_large", `The request body is larger than the limit of ${limit.toLocaleString("en")} bytes.`);

/** 413 before reading when the declared Content-Length is already beyond the limit. */
export function assertDeclaredLength(headers: Headers, limit: number): number | null {
  const declared = Number(headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > limit) throw tooLargeError(limit);
  return Number.isFinite(declared) ? declared : null;
}

/** Joins chunks read while counting; 413 as soon as they pass the limit. */
export class BodyCollector {
  private readonly chunks: Uint8Array[] = [];
  private size = 0;
  constructor(private readonly limit: number) {}

  add(chunk: Uint8Array): void {
    this.size += chunk.byteLength;
    if (this.size > this.limit) throw tooLargeError(this.limit);
    this.chunks.push(chunk);
  }

  text(): string {
    if (this.chunks.length === 1) return decodeUtf8(this.chunks[0]);
    const bytes = new Uint8Array(this.size);
    let offset = 0;
    for (const chunk of this.chunks) {
      bytes.set(chunk, offset);
      offset += chunk.byteLength;
    }
    return decodeUtf8(bytes);
  }
}

const strictUtf8 = new TextDecoder("utf-8", { fatal: true });

export function decodeUtf8(bytes: Uint8Array): string {
  try {
    return strictUtf8.decode(bytes);
  } catch {
    throw new AppError("invalid:body", "The request body is not valid UTF-8.", { details: [{ path: "", message: "Not UTF-8" }] });
  }
}

async function parseJsonBody<S extends Schema>(input: ApiInput, schema: S, limit: number): Promise<z.output<S>> {
  const contentType = input.headers.get("content-type") ?? "";
  const text = await input.readBody(limit);
  if (text.trim() !== "" && !/^application\/([\w.+-]*\+)?json\b/i.test(contentType)) {
    throw new AppError("invalid:body", "Send the body as JSON with Content-Type: application/json.", {
      details: [{ path: "", message: `Content-Type is ${contentType || "missing"}` }],
    });
  }
  let value: unknown;
  if (text.trim() === "") value = undefined;
  else {
    try {
      value = JSON.parse(text);
    } catch (error) {
      throw new AppError("invalid:body", "The request body is not valid JSON.", {
        details: [{ path: "", message: error instanceof Error ? error.message.slice(0, 200) : "Malformed JSON" }],
      });
    }
  }
  const result = await schema.safeParseAsync(value);
  if (!result.success) {
    throw new AppError("invalid:body", "The request body is not valid.", { details: zodDetails(result.error) });
  }
  return result.data;
}

function queryObject(searchParams: URLSearchParams): Record<string, string | string[]> {
  const result: Record<string, string | string[]> = {};
  for (const key of new Set(searchParams.keys())) {
    const all = searchParams.getAll(key);
    result[key] = all.length === 1 ? all[0] : all;
  }
  return result;
}

const unsafeMethods = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * A browser carrying the session cookie must be on our own origin to change anything (scripts that
 * send a Bearer token carry no ambient credentials, so they are exempt).
 */
function assertSameOrigin(method: string, headers: Headers) {
  if (!unsafeMethods.has(method)) return;
  const origin = headers.get("origin");
  const fetchSite = headers.get("sec-fetch-site");
  if (fetchSite && fetchSite !== "same-origin" && fetchSite !== "none") {
    throw new AppError("forbidden:cross_site", "Cross-site requests may not change data.");
  }
  if (!origin) return;
  const host = headers.get("x-forwarded-host") ?? headers.get("host");
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    originHost = "";
  }
  if (!host || originHost !== host) throw new AppError("forbidden:cross_site", "Cross-site requests may not change data.");
}

const pathOf = (url: string) => url.split("?", 1)[0];
const searchOf = (url: string) => (url.includes("?") ? url.slice(url.indexOf("?")) : "");

/**
 * Runs the checks, then `invoke` with the checked context. The handler's Response passes through; any
 * other value becomes a JSON answer with status 200; anything thrown becomes the error's JSON answer
 * (AppError → its status, database down → 503, anything else → logged 500).
 */
export async function runApiPipeline(
  options: ApiRouteOptions<Schema | undefined, Schema | undefined, Schema | undefined>,
  input: ApiInput,
  invoke: (context: ApiCoreContext<unknown, unknown, unknown, boolean | undefined>) => Promise<unknown> | unknown,
): Promise<ApiOutcome> {
  try {
    let actor: Actor | null = null;
    if (options.auth !== false) {
      actor = await requireActor({ headers: input.headers }, input.readSession);
      if (actor.via === "session") assertSameOrigin(input.method, input.headers);
      if (options.permission) requirePermission(actor, options.permission);
    }

    let params: unknown = input.params;
    if (options.params) {
      const parsed = options.params.safeParse(input.params);
      if (!parsed.success) throw new AppError("not_found", "Not found.");
      params = parsed.data;
    }

    let query: unknown = undefined;
    if (options.query) {
      const parsed = options.query.safeParse(queryObject(new URLSearchParams(searchOf(input.url))));
      if (!parsed.success) {
        throw new AppError("invalid:query", "The query string is not valid.", { details: zodDetails(parsed.error, "query") });
      }
      query = parsed.data;
    }

    let body: unknown = undefined;
    if (options.body) body = await parseJsonBody(input, options.body, options.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES);

    const result = await invoke({ actor, body, query, params } as ApiCoreContext<unknown, unknown, unknown, boolean | undefined>);
    return result instanceof Response ? { response: result } : { status: 200, data: result };
  } catch (error) {
    const appError = toAppError(error, `${input.method} ${pathOf(input.url)}`);
    return { status: appError.status, data: appError.toBody(), headers: appError.headers };
  }
}
