import { listCommentsByVersion, postComment } from "@/server/comments/store";
import { requireVersion } from "@/server/comparisons/versions";
import { apiRoute, json } from "@/server/http/route";
import { postCommentRequestSchema, versionParams } from "./schema";

/** The version's comments, oldest first (replies carry parentId). */
export const GET = apiRoute({ permission: "scenario:read", params: versionParams }, async ({ actor, params }) => {
  await requireVersion(actor, params.id, params.n);
  return { comments: await listCommentsByVersion(params.id, params.n) };
});

/** Comments on this version (planners, finance); mentioned members are e-mailed. 201 with the comment. */
export const POST = apiRoute({ permission: "comment:write", params: versionParams, body: postCommentRequestSchema }, async ({ actor, params, body }) =>
  json(await postComment(actor, { scenarioId: params.id, version: params.n, ...body }), 201),
);
