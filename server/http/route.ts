import "server-only";
import { z } from "zod";
import { AppError, toAppError, type ErrorDetail } from "@/server/errors";
import { requireActor, requirePermission, type Actor } from "@/server/authz/actor";
import type { Permission } from "@/server/authz/roles";

/** Default limit for JSON bodies; uploads set their own (`maxBodyBytes`) or stream the request themselves. */
export const DEFAULT_MAX_BODY_BYTES = 1_000_000;

type Schema = z.ZodType;
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

/** What Next passes as the second argument of a route handler (params is a Promise since Next 15). */
type RouteContext = { params: Promise<Record<string, string | string[] | undefined>> };

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

export type ApiRouteContext<B, Q, P, A extends boolean | undefined> = {
  actor: A extends false ? null : Actor;
  body: Out<B>;
  query: Out<Q>;
  params: P extends z.ZodType ? z.output<P> : Record<string, string | string[] | undefined>;
  request: Request;
};

type Handler<Ctx> = (context: Ctx) => Promise<Response | object | null> | Response | object | null;

/** A JSON response with a status, e.g. `return json(created, 201)`. */
export function json(data: unknown, status = 200, headers?: HeadersInit): Response {
  return Response.json(data, { status, headers });
}

/** 204 No Content. */
export const noContent = () => new Response(null, { status: 204 });

export function zodDetails(error: z.ZodError, prefix?: string): ErrorDetail[] {
  return error.issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].filter((part) => part !== undefined && part !== "").join("."),
    message: issue.message,
  }));
}

async function readBody(request: Request, limit: number): Promise<string> {
  const declared = Number(request.headers.get("content-length") ?? NaN);
  const tooLarge = () =>
    new AppError("too_large", `The request body is larger than the limit of ${limit.toLocaleString("en")} bytes.`);
  if (Number.isFinite(declared) && declared > limit) throw tooLarge();
  if (!request.body) return "";
  // A declared length within the limit is what HTTP framing delivers: read it in one native call
  // (the hot path of predictions). Without one (chunked), count while reading.
  if (Number.isFinite(declared)) return decodeUtf8(new Uint8Array(await request.arrayBuffer()));
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(size);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return decodeUtf8(bytes);
}

const strictUtf8 = new TextDecoder("utf-8", { fatal: true });

function decodeUtf8(bytes: Uint8Array): string {
  try {
    return strictUtf8.decode(bytes);
  } catch {
    throw new AppError("invalid:body", "The request body is not valid UTF-8.", { details: [{ path: "", message: "Not UTF-8" }] });
  }
}

async function parseJsonBody<S extends Schema>(request: Request, schema: S, limit: number): Promise<z.output<S>> {
  const contentType = request.headers.get("content-type") ?? "";
  const text = await readBody(request, limit);
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

function queryObject(url: URL): Record<string, string | string[]> {
  const result: Record<string, string | string[]> = {};
  for (const key of new Set(url.searchParams.keys())) {
    const all = url.searchParams.getAll(key);
    result[key] = all.length === 1 ? all[0] : all;
  }
  return result;
}

const unsafeMethods = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * A browser carrying the session cookie must be on our own origin to change anything (scripts that
 * send a Bearer token carry no ambient credentials, so they are exempt).
 */
function assertSameOrigin(request: Request) {
  if (!unsafeMethods.has(request.method)) return;
  const origin = request.headers.get("origin");
  const fetchSite = request.headers.get("sec-fetch-site");
  if (fetchSite && fetchSite !== "same-origin" && fetchSite !== "none") {
    throw new AppError("forbidden:cross_site", "Cross-site requests may not change data.");
  }
  if (!origin) return;
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    originHost = "";
  }
  if (!host || originHost !== host) throw new AppError("forbidden:cross_site", "Cross-site requests may not change data.");
}

/**
 * Wraps a route handler: authentication (401), permission (403), path parameters (404), body size
 * (413), JSON body and query validation (422), and turns anything thrown into the standard error
 * body (AppError → its status, database down → 503, anything else → logged 500).
 * The handler returns a Response, or any value to send as JSON with status 200.
 *
 * @example
 * // app/api/fits/[id]/review/route.ts
 * export const POST = apiRoute(
 *   { permission: "fit:review", params: z.object({ id: z.uuid() }), body: reviewRequestSchema },
 *   async ({ actor, params, body }) => {
 *     const fit = await getFitById(params.id);
 *     assertInWorkspace(actor, fit, "fit");               // another workspace's fit: 404
 *     return json(await reviewFit({ fit, actor, ...body }), 200);
 *   },
 * );
 */
export function apiRoute<
  B extends Schema | undefined = undefined,
  Q extends Schema | undefined = undefined,
  P extends Schema | undefined = undefined,
  A extends boolean | undefined = undefined,
>(
  options: ApiRouteOptions<B, Q, P> & { auth?: A },
  handler: Handler<ApiRouteContext<B, Q, P, A>>,
): (request: Request, context: RouteContext) => Promise<Response> {
  return async (request, context) => {
    try {
      let actor: Actor | null = null;
      if (options.auth !== false) {
        actor = await requireActor(request);
        if (actor.via === "session") assertSameOrigin(request);
        if (options.permission) requirePermission(actor, options.permission);
      }

      const rawParams = (await context?.params) ?? {};
      let params: unknown = rawParams;
      if (options.params) {
        const parsed = options.params.safeParse(rawParams);
        if (!parsed.success) throw new AppError("not_found", "Not found.");
        params = parsed.data;
      }

      let query: unknown = undefined;
      if (options.query) {
        const parsed = options.query.safeParse(queryObject(new URL(request.url)));
        if (!parsed.success) {
          throw new AppError("invalid:query", "The query string is not valid.", { details: zodDetails(parsed.error, "query") });
        }
        query = parsed.data;
      }

      let body: unknown = undefined;
      if (options.body) body = await parseJsonBody(request, options.body, options.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES);

      const result = await handler({ actor, body, query, params, request } as ApiRouteContext<B, Q, P, A>);
      if (result instanceof Response) return result;
      return Response.json(result);
    } catch (error) {
      return toAppError(error, `${request.method} ${new URL(request.url).pathname}`).toResponse();
    }
  };
}

/** Path parameters of routes shaped like /api/things/[id] with uuid ids. */
export const idParams = z.object({ id: z.uuid() });
