import { afterEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { createApiToken } from "@/server/data/api-tokens";
import { AppError } from "@/server/errors";
import { apiRoute, idParams, json } from "@/server/http/route";
import { assertInWorkspace } from "@/server/authz/actor";
import { apiRequest, makeWorkspace, routeContext } from "./helpers";

async function tokenFor(roles: Parameters<typeof makeWorkspace>[0][string]) {
  const { workspace, members } = await makeWorkspace({ someone: roles });
  const { token } = await createApiToken({ workspaceId: workspace.id, userId: members.someone.id, name: "t", expiresAt: null });
  return { token, workspace };
}

const bodySchema = z.object({ name: z.string().min(1), amounts: z.array(z.number().nonnegative()) });

const route = apiRoute(
  { permission: "fit:create", params: idParams, body: bodySchema, query: z.object({ level: z.coerce.number().min(0.5).max(0.999).default(0.95) }) },
  async ({ actor, body, params, query }) => json({ who: actor.email, id: params.id, name: body.name, level: query.level }, 201),
);
const id = "0b0e3e6c-2f7d-4d8e-9c55-1d1a1e0f0a01";

afterEach(() => vi.restoreAllMocks());

describe("apiRoute", () => {
  it("runs the handler with the typed actor, params, query and body", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest(`/api/x/${id}?level=0.9`, { method: "POST", token, json: { name: "n", amounts: [1, 2] } }), routeContext({ id }));
    expect(response.status).toBe(201);
    expect(await response.json()).toMatchObject({ id, name: "n", level: 0.9 });
  });

  it("answers 401 for a bad token and 403 for a role without the permission", async () => {
    const bad = await route(apiRequest(`/api/x/${id}`, { method: "POST", token: "trib_nope", json: {} }), routeContext({ id }));
    expect(bad.status).toBe(401);
    expect(await bad.json()).toEqual({ error: expect.stringMatching(/API token is not valid/), details: [] });

    const { token } = await tokenFor(["planner"]);
    const forbidden = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, json: { name: "n", amounts: [] } }), routeContext({ id }));
    expect(forbidden.status).toBe(403);
    expect((await forbidden.json()).error).toMatch(/needs the analyst role/);
  });

  it("answers 404 for a path parameter that cannot exist, before reading the body", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest("/api/x/not-a-uuid", { method: "POST", token, body: "{" }), routeContext({ id: "not-a-uuid" }));
    expect(response.status).toBe(404);
  });

  it("answers 422 with one detail per problem, each with its path", async () => {
    const { token } = await tokenFor(["analyst"]);
    const response = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, json: { name: "", amounts: [1, -2, "3"] } }), routeContext({ id }));
    expect(response.status).toBe(422);
    const body = await response.json();
    expect(body.error).toBe("The request body is not valid.");
    expect(body.details.map((d: { path: string }) => d.path).sort()).toEqual(["amounts.1", "amounts.2", "name"]);

    const query = await route(apiRequest(`/api/x/${id}?level=2`, { method: "POST", token, json: { name: "n", amounts: [] } }), routeContext({ id }));
    expect(query.status).toBe(422);
    expect((await query.json()).details[0].path).toBe("query.level");
  });

  it("answers 422 for malformed JSON or a body that is not JSON", async () => {
    const { token } = await tokenFor(["analyst"]);
    const malformed = await route(
      apiRequest(`/api/x/${id}`, { method: "POST", token, body: '{"name": ', headers: { "content-type": "application/json" } }),
      routeContext({ id }),
    );
    expect(malformed.status).toBe(422);
    expect((await malformed.json()).error).toBe("The request body is not valid JSON.");
    const form = await route(apiRequest(`/api/x/${id}`, { method: "POST", token, body: "name=x", headers: { "content-type": "application/x-www-form-urlencoded" } }), routeContext({ id }));
    expect(form.status).toBe(422);
  });

  it("answers 413 for a body over the limit, declared or streamed", async () => {
    const { token } = await tokenFor(["analyst"]);
    const small = apiRoute({ body: z.unknown(), maxBodyBytes: 100 }, () => ({ ok: true }));
    const big = JSON.stringify({ name: "x".repeat(200) });
    expect((await small(apiRequest("/api/s", { method: "POST", token, json: JSON.parse(big) }), routeContext())).status).toBe(413);
    const stream = new ReadableStream({
      start(controller) {
        controller.enqueue(new TextEncoder().encode(big));
        controller.close();
      },
    });
    const streamed = new Request("http://localhost:3100/api/s", {
      method: "POST",
      headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
      body: stream,
      duplex: "half",
    } as RequestInit);
    expect((await small(streamed, routeContext())).status).toBe(413);
  });

  it("answers 404 for another workspace's object via assertInWorkspace", async () => {
    const { token } = await tokenFor(["analyst"]);
    const other = await makeWorkspace({ x: ["admin"] });
    const lookup = apiRoute({}, ({ actor }) => {
      assertInWorkspace(actor, { workspaceId: other.workspace.id }, "fit");
      return { leaked: true };
    });
    const response = await lookup(apiRequest("/api/fits/1", { token }), routeContext());
    expect(response.status).toBe(404);
    expect(await response.json()).toEqual({ error: "No such fit in this workspace.", details: [] });
  });

  it("turns an unreachable database into 503 and anything unexpected into a generic, logged 500", async () => {
    const { token } = await tokenFor(["analyst"]);
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const down = apiRoute({}, () => {
      throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:54329"), { code: "ECONNREFUSED" });
    });
    const response = await down(apiRequest("/api/d", { token }), routeContext());
    expect(response.status).toBe(503);
    expect((await response.json()).error).toMatch(/database is not answering/);

    const boom = apiRoute({}, () => {
      throw new Error("secret internals: password=hunter2");
    });
    const failed = await boom(apiRequest("/api/b", { token }), routeContext());
    expect(failed.status).toBe(500);
    const body = await failed.json();
    expect(body).toEqual({ error: "Something went wrong on our side. The error was logged.", details: [] });
    expect(logged).toHaveBeenCalled();
  });

  it("passes AppErrors through with their status and details", async () => {
    const { token } = await tokenFor(["analyst"]);
    const conflict = apiRoute({}, () => {
      throw new AppError("conflict:version", "Version 3 exists; reload.", { details: [{ path: "baseVersion", message: "stale" }] });
    });
    const response = await conflict(apiRequest("/api/c", { token }), routeContext());
    expect(response.status).toBe(409);
    expect(await response.json()).toEqual({ error: "Version 3 exists; reload.", details: [{ path: "baseVersion", message: "stale" }] });
  });
});
