import { apiRoute, idParams } from "@/server/http/route";
import { fitResponse } from "@/server/fits/api-shape";
import { transitionFit } from "@/server/fits/workflow";
import { commentRequestSchema } from "../schema";

/** Any state but retired → retired; an approved fit stays frozen, planners can no longer start on it. */
export const POST = apiRoute({ permission: "fit:retire", params: idParams, body: commentRequestSchema }, async ({ actor, params, body }) =>
  fitResponse(await transitionFit({ actor, fitId: params.id, action: "retire", comment: body.comment })),
);
