import "server-only";
import type { IncomingMessage, ServerResponse } from "node:http";
import type { NextApiRequest, NextApiResponse } from "next";
import { auth } from "@/server/auth";
import { AppError, toAppError } from "@/server/errors";
import {
  assertDeclaredLength,
  BodyCollector,
  runApiPipeline,
  type ApiCoreContext,
  type ApiHandler,
  type ApiOutcome,
  type ApiRouteOptions,
  type Schema,
} from "@/server/http/api-pipeline";

// The same pipeline as apiRoute (server/http/route.ts), for a route in pages/api: Next's Pages Router
// hands API routes Node's request and response as they are, where an App Router route handler gets
// a web Request and stream made from them. For the prediction route, called on every slider move,
// that difference was 40% of its throughput (DEVELOPERS.md, "Predictions through the route"); every
// other route stays an App Router route handler.

/** What Next's Pages Router passes: Node's request with `query` (path parameters win over the query string). */
type PagesRequest = IncomingMessage & { query?: Record<string, string | string[] | undefined> };

/**
 * An API route of the Pages Router: `export default pagesApiRoute("POST", options, handler)`, with
 * `export const config = { api: { bodyParser: false } }` so that the pipeline reads and limits the body.
 */
export type PagesApiHandler = (request: PagesRequest, response: ServerResponse) => Promise<void>;

function headersOf(request: IncomingMessage): Headers {
  const headers = new Headers();
  for (const [name, value] of Object.entries(request.headers)) {
    if (typeof value === "string") headers.set(name, value);
    else if (Array.isArray(value)) for (const one of value) headers.append(name, one);
  }
  return headers;
}

function readBody(request: IncomingMessage, headers: Headers, limit: number): Promise<string> {
  assertDeclaredLength(headers, limit);
  // Next's body parser already read it: the route file lacks `config.api.bodyParser: false`.
  if (request.readableEnded) return Promise.reject(new Error("pagesApiRoute: the body was consumed; export config = { api: { bodyParser: false } }"));
  const collected = new BodyCollector(limit);
  return new Promise<string>((resolve, reject) => {
    // Past the limit: stop collecting; Node discards the rest once the 413 has been sent.
    const fail = (error: unknown) => {
      request.off("data", onData);
      reject(error);
    };
    const onData = (chunk: Buffer) => {
      try {
        collected.add(chunk);
      } catch (error) {
        fail(error);
      }
    };
    request.on("data", onData);
    request.once("end", () => {
      try {
        resolve(collected.text());
      } catch (error) {
        reject(error);
      }
    });
    request.once("error", (error) => reject(new AppError("invalid:body", "The request body could not be read.", { cause: error })));
  });
}

/**
 * The Auth.js session from the request's cookies. Auth.js would re-issue the session cookie on the
 * response passed to it; it gets a throwaway instead, so that (as for route handlers) an answer in
 * flight while the member signs out cannot put the session back.
 */
function sessionReader(request: IncomingMessage) {
  return () => auth(request as NextApiRequest, { headers: new Headers() } as unknown as NextApiResponse);
}

async function send(response: ServerResponse, outcome: ApiOutcome): Promise<void> {
  if ("response" in outcome) {
    response.statusCode = outcome.response.status;
    outcome.response.headers.forEach((value, name) => response.setHeader(name, value));
    response.end(Buffer.from(await outcome.response.arrayBuffer()));
    return;
  }
  response.statusCode = outcome.status;
  for (const [name, value] of Object.entries(outcome.headers ?? {})) response.setHeader(name, value);
  response.setHeader("content-type", "application/json");
  response.end(JSON.stringify(outcome.data));
}

/**
 * apiRoute for the Pages Router: one method per file (others: 405 with Allow; OPTIONS: 204), the
 * same checks, errors and JSON as every App Router route handler. The handler gets no web Request.
 *
 * @example
 * // pages/api/fits/[id]/predict.ts
 * export const config = { api: { bodyParser: false } };
 * export default pagesApiRoute("POST", { permission: "fit:predict", params: idParams, body }, async ({ actor, params, body }) => …);
 */
export function pagesApiRoute<
  B extends Schema | undefined = undefined,
  Q extends Schema | undefined = undefined,
  P extends Schema | undefined = undefined,
  A extends boolean | undefined = undefined,
>(
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE",
  options: ApiRouteOptions<B, Q, P> & { auth?: A },
  handler: ApiHandler<ApiCoreContext<B, Q, P, A>>,
): PagesApiHandler {
  const allow = `${method}, OPTIONS`;
  return async (request, response) => {
    if (request.method === "OPTIONS") {
      response.writeHead(204, { Allow: allow }).end();
      return;
    }
    if (request.method !== method) {
      await send(response, { status: 405, data: { error: `This route answers ${method} only.`, details: [] }, headers: { Allow: allow } });
      return;
    }
    try {
      const headers = headersOf(request);
      const outcome = await runApiPipeline(
        options,
        {
          method,
          url: request.url ?? "/",
          headers,
          params: request.query ?? {},
          readBody: (limit) => readBody(request, headers, limit),
          readSession: sessionReader(request),
        },
        (checked) => handler(checked as ApiCoreContext<B, Q, P, A>),
      );
      await send(response, outcome);
    } catch (error) {
      // Past the pipeline (writing a handler's own Response failed): still our JSON error, never the
      // Pages Router's HTML error page; once the answer has started, all that is left is to cut it.
      const appError = toAppError(error, `${method} ${(request.url ?? "/").split("?", 1)[0]}`);
      if (response.headersSent) response.destroy();
      else await send(response, { status: appError.status, data: appError.toBody(), headers: appError.headers });
    }
  };
}
