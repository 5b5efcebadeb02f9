import "server-only";
import { z } from "zod";
import {
  assertDeclaredLength,
  BodyCollector,
  decodeUtf8,
  runApiPipeline,
  type ApiCoreContext,
  type ApiHandler,
  type ApiOutcome,
  type ApiRouteOptions,
  type Schema,
} from "@/server/http/api-pipeline";

export { DEFAULT_MAX_BODY_BYTES, zodDetails, type ApiRouteOptions } from "@/server/http/api-pipeline";

/** What Next passes as the second argument of a route handler (params is a Promise since Next 15). */
type RouteContext = { params: Promise<Record<string, string | string[] | undefined>> };

export type ApiRouteContext<B, Q, P, A extends boolean | undefined> = ApiCoreContext<B, Q, P, A> & { request: Request };

/** A JSON response with a status, e.g. `return json(created, 201)`. */
export function json(data: unknown, status = 200, headers?: HeadersInit): Response {
  return Response.json(data, { status, headers });
}

/** 204 No Content. */
export const noContent = () => new Response(null, { status: 204 });

async function readBody(request: Request, limit: number): Promise<string> {
  const declared = assertDeclaredLength(request.headers, limit);
  if (!request.body) return "";
  // A declared length within the limit is what HTTP framing delivers: read it in one native call.
  // Without one (chunked), count while reading.
  if (declared !== null) return decodeUtf8(new Uint8Array(await request.arrayBuffer()));
  const reader = request.body.getReader();
  const collected = new BodyCollector(limit);
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    try {
      collected.add(value);
    } catch (error) {
      await reader.cancel().catch(() => {});
      throw error;
    }
  }
  return collected.text();
}

const toResponse = (outcome: ApiOutcome): Response =>
  "response" in outcome ? outcome.response : Response.json(outcome.data, { status: outcome.status, headers: outcome.headers });

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
  handler: ApiHandler<ApiRouteContext<B, Q, P, A>>,
): (request: Request, context: RouteContext) => Promise<Response> {
  return async (request, context) => {
    const url = new URL(request.url);
    const outcome = await runApiPipeline(
      options,
      {
        method: request.method,
        url: url.pathname + url.search,
        headers: request.headers,
        params: (await context?.params) ?? {},
        readBody: (limit) => readBody(request, limit),
      },
      (checked) => handler({ ...checked, request } as ApiRouteContext<B, Q, P, A>),
    );
    return toResponse(outcome);
  };
}

/** Path parameters of routes shaped like /api/things/[id] with uuid ids. */
export const idParams = z.object({ id: z.uuid() });
