import { z } from "zod";
import { assertInWorkspace } from "@/server/authz";
import { AppError } from "@/server/errors";
import { apiRoute } from "@/server/http/route";
import { getScenarioHead, getScenarioVersion } from "@/server/scenarios/store";

const params = z.object({ id: z.uuid(), n: z.coerce.number().int().min(1).max(2_147_483_647) });

/** One version: its plan, the server's prediction snapshot and warnings. */
export const GET = apiRoute({ permission: "scenario:read", params }, async ({ actor, params }) => {
  const head = await getScenarioHead(params.id);
  assertInWorkspace(actor, head, "scenario");
  const version = await getScenarioVersion(params.id, params.n);
  if (!version) throw new AppError("not_found:version", `This scenario has no version ${params.n}.`);
  return version;
});
