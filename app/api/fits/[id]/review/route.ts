import { apiRoute, idParams } from "@/server/http/route";
import { fitResponse } from "@/server/fits/api-shape";
import { transitionFit } from "@/server/fits/workflow";
import { reviewRequestSchema } from "../schema";

/** In review → approved (never by the fit's author) or changes requested (with a comment). */
export const POST = apiRoute({ permission: "fit:review", params: idParams, body: reviewRequestSchema }, async ({ actor, params, body }) =>
  fitResponse(await transitionFit({ actor, fitId: params.id, action: body.decision, comment: body.comment })),
);
