import { afterEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { createApiToken } from "@/server/data/api-tokens";
import { AppError } from "@/server/errors";
import { apiRoute, idParams, json, type ApiRouteOptions } from "@/server/http/route";
import { pagesApiRoute } from "@/server/http/pages-route";
import { assertInWorkspace, type Actor } from "@/server/authz/actor";
import { callPagesRoute } from "@/tests/support/pages-route";
import { apiRequest, makeWorkspace, routeContext } from "./helpers";

async function tokenFor(roles: Parameters<typeof makeWorkspace>[0][string]) {
  const { workspace, members } = await makeWorkspace({ someone: roles });
  const { token } = await createApiToken({ workspaceId: workspace.id, userId: members.someone.id, name: "t", expiresAt: null });
  return { token, workspace };
}

const bodySchema = z.object({ name: z.string().min(1), amounts: z.array(z.number().nonnegative()) });

const id = "0b0e3e6c-2f7d-4d8e-9c55-1d1a1e0f0a01";

afterEach(() => vi.restoreAllMocks());

// Both routers' adapters run the same pipeline (server/http/api-pipeline.ts): every check below holds for each.
type Call = (request: Request, params?: Record<string, string>, options?: { chunked?: boolean }) => Promise<Response>;
type AnyOptions = ApiRouteOptions<z.ZodType | undefined, z.ZodType | undefined, z.ZodType | undefined>;
type AnyHandler = (context: { actor: Actor; body: any; params: any; query: any }) => unknown;
const routers: { name: string; make: (method: "GET" | "POST", options: AnyOptions, handler: AnyHandler) => Call }[] = [
  {
    name: "apiRoute (App Router route handler)",
    make: (_method, options, handler) => {
      const route = apiRoute(options, handler as Parameters<typeof apiRoute>[1]);
      return (request, params = {}, { chunked } = {}) => route(chunked ? asStream(request) : request, routeContext(params));
    },
  },
  {
    name: "pagesApiRoute (Pages Router API route, over HTTP)",
    make: (method, options, handler) => {
      const route = pagesApiRoute(method, options, handler as Parameters<typeof pagesApiRoute>[2]);
      return (request, params = {}, { chunked } = {}) => callPagesRoute(route, request, params, { chunked });
    },
  },
];

/** The same request with its body as a stream of unknown length (sent chunked). */
function asStream(request: Request): Request {
  const body = request.body;
  return new Request(request.url, { method: request.method, headers: request.headers, body, duplex: "half" } as RequestInit);
}

describe.each(routers)("$name", ({ make }) => {
  const route = make(
    "POST",
    { permission: "fit:create", params: idParams, body: bodySchema, query: z.object({ level: z.coerce.number().min(0.5).max(0.999).default(0.95) }) },
    async ({ actor, body, params, query }) => json({ who: actor.email, id: params.id, name: body.name, level: query.level }, 201),
  );
  it("runs the handler with the typed actor, params, query and body", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest(`/api/x/${id}?level=0.9`, { method: "POST", token, json: { name: "n", amounts: [1, 2] } }), { id });
    expect(response.status).toBe(201);
    expect(await response.json()).toMatchObject({ id, name: "n", level: 0.9 });
  });

  it("answers 401 for a bad token and 403 for a role without the permission", async () => {
    const bad = await route(apiRequest(`/api/x/${id}`, { method: "POST", token: "trib_nope", json: {} }), { id });
    expect(bad.status).toBe(401);
    expect(await bad.json()).toEqual({ error: expect.stringMatching(/API token is not valid/), details: [] });

    const { token } = await tokenFor(["planner"]);
    const forbidden = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, json: { name: "n", amounts: [] } }), { id });
    expect(forbidden.status).toBe(403);
    expect((await forbidden.json()).error).toMatch(/needs the analyst role/);
  });

  it("answers 404 for a path parameter that cannot exist, before reading the body", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest("/api/x/not-a-uuid", { method: "POST", token, body: "{" }), { id: "not-a-uuid" });
    expect(response.status).toBe(404);
  });

  it("answers 422 with one detail per problem, each with its path", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, json: { name: "", amounts: [1, -2, "3"] } }), { id });
    expect(response.status).toBe(422);
    const body = await response.json();
    expect(body.error).toBe("The request body is not valid.");
    expect(body.details.map((d: { path: string }) => d.path).sort()).toEqual(["amounts.1", "amounts.2", "name"]);

    const query = await route(apiRequest(`/api/x/${id}?level=2`, { method: "POST", token, json: { name: "n", amounts: [] } }), { id });
    expect(query.status).toBe(422);
    expect((await query.json()).details[0].path).toBe("query.level");
  });

  it("answers 422 for malformed JSON or a body that is not JSON", async () => {
    const { token } = await tokenFor(["analyst"]);
    const malformed = await route(
      apiRequest(`/api/x/${id}`, { method: "POST", token, body: '{"name": ', headers: { "content-type": "application/json" } }),
      { id },
    );
    expect(malformed.status).toBe(422);
    expect((await malformed.json()).error).toBe("The request body is not valid JSON.");
    const form = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, body: "name=x", headers: { "content-type": "application/x-www-form-urlencoded" } }), { id });
    expect(form.status).toBe(422);
  });

  it("answers 413 for a body over the limit, declared or streamed", async () => {
    const { token } = await tokenFor(["analyst"]);
    const small = make("POST", { body: z.unknown(), maxBodyBytes: 100 }, () => ({ ok: true }));
    const big = { name: "x".repeat(200) };
    const declared = await small(apiRequest("/api/s", { method: "POST", token, json: big }));
    expect(declared.status).toBe(413);
    expect((await declared.json()).error).toMatch(/larger than the limit of 100 bytes/);
    expect((await small(apiRequest("/api/s", { method: "POST", token, json: big }), {}, { chunked: true })).status).toBe(413);
    expect((await small(apiRequest("/api/s", { method: "POST", token, json: { name: "x" } }), {}, { chunked: true })).status).toBe(200);
  });

  it("answers 404 for another workspace's object via assertInWorkspace", async () => {
    const { token } = await tokenFor(["analyst"]);
    const other = await makeWorkspace({ x: ["admin"] });
    const lookup = make("GET", {}, ({ actor }) => {
      assertInWorkspace(actor, { workspaceId: other.workspace.id }, "fit");
      return { leaked: true };
    });
    const response = await lookup(apiRequest("/api/fits/1", { token }));
    expect(response.status).toBe(404);
    expect(await response.json()).toEqual({ error: "No such fit in this workspace.", details: [] });
  });

  it("turns an unreachable database into 503 and anything unexpected into a generic, logged 500", async () => {
    const { token } = await tokenFor(["analyst"]);
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const down = make("GET", {}, () => {
      throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:54329"), { code: "ECONNREFUSED" });
    });
    const response = await down(apiRequest("/api/d", { token }));
    expect(response.status).toBe(503);
    expect((await response.json()).error).toMatch(/database is not answering/);

    const boom = make("GET", {}, () => {
      throw new Error("secret internals: password=hunter2");
    });
    const failed = await boom(apiRequest("/api/b", { token }));
    expect(failed.status).toBe(500);
    const body = await failed.json();
    expect(body).toEqual({ error: "Something went wrong on our side. The error was logged.", details: [] });
    expect(logged).toHaveBeenCalled();
  });

  it("passes AppErrors through with their status and details", async () => {
    const { token } = await tokenFor(["analyst"]);
    const conflict = make("GET", {}, () => {
      throw new AppError("conflict:version", "Version 3 exists; reload.", { details: [{ path: "baseVersion", message: "stale" }] });
    });
    const response = await conflict(apiRequest("/api/c", { token }));
    expect(response.status).toBe(409);
    expect(await response.json()).toEqual({ error: "Version 3 exists; reload.", details: [{ path: "baseVersion", message: "stale" }] });
  });
});

describe("pagesApiRoute only", () => {
  const echo = pagesApiRoute("POST", { body: z.object({ name: z.string() }) }, ({ actor, body }) => ({ who: actor.email, name: body.name }));

  it("answers another method with 405 and Allow, OPTIONS with 204, without running the handler", async () => {
    const { token } = await tokenFor(["analyst"]);
    const get = await callPagesRoute(echo, apiRequest("/api/e", { token }));
    expect(get.status).toBe(405);
    expect(get.headers.get("allow")).toBe("POST, OPTIONS");
    expect(await get.json()).toEqual({ error: "This route answers POST only.", details: [] });
    const options = await callPagesRoute(echo, apiRequest("/api/e", { method: "OPTIONS" }));
    expect(options.status).toBe(204);
    expect(options.headers.get("allow")).toBe("POST, OPTIONS");
  });

  it("answers a handler's Response that fails while being written with the JSON 500, not an HTML page", async () => {
    const { token } = await tokenFor(["analyst"]);
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const broken = pagesApiRoute("GET", {}, () => new Response(new ReadableStream({ pull: (controller) => controller.error(new Error("disk gone")) })));
    const response = await callPagesRoute(broken, apiRequest("/api/broken", { token }));
    expect(response.status).toBe(500);
    expect(response.headers.get("content-type")).toBe("application/json");
    expect(await response.json()).toEqual({ error: "Something went wrong on our side. The error was logged.", details: [] });
    expect(logged).toHaveBeenCalled();
  });

  it("answers 401 without a token or session, and refuses a body that is not UTF-8", async () => {
    const anonymous = await callPagesRoute(echo, apiRequest("/api/e", { method: "POST", json: { name: "n" } }));
    expect(anonymous.status).toBe(401);
    const { token } = await tokenFor(["analyst"]);
    const latin1 = await callPagesRoute(
      echo,
      apiRequest("/api/e", { method: "POST", token, body: new Uint8Array([0x7b, 0x22, 0x6e, 0x61, 0x6d, 0x65, 0x22, 0x3a, 0x22, 0xe9, 0x22, 0x7d]), headers: { "content-type": "application/json" } }),
    );
    expect(latin1.status).toBe(422);
    expect((await latin1.json()).error).toBe("The request body is not valid UTF-8.");
    const ok = await callPagesRoute(echo, apiRequest("/api/e", { method: "POST", token, json: { name: "é" } }));
    expect(await ok.json()).toMatchObject({ name: "é" });
  });
});
