import { apiRoute, idParams } from "@/server/http/route";
import { fitResponse } from "@/server/fits/api-shape";
import { transitionFit } from "@/server/fits/workflow";
import { commentRequestSchema } from "../schema";

/** Draft (or changes requested) → in review; only the fit's author. */
export const POST = apiRoute({ permission: "fit:submit", params: idParams, body: commentRequestSchema }, async ({ actor, params, body }) =>
  fitResponse(await transitionFit({ actor, fitId: params.id, action: "submit", comment: body.comment })),
);
