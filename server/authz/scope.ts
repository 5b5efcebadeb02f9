// Workspace scoping, free of the request layer: the domain modules (and the seed, which acts as a
// member without a request) use it without importing Next or Auth.js.
import { AppError } from "@/server/errors";
import type { Actor } from "./actor";

/**
 * Objects of another workspace do not exist for this actor: a missing object and a foreign one both
 * give 404, so ids of other workspaces cannot be probed. Pass the loaded object (or its workspaceId).
 *
 * @example const fit = await getFitById(id); assertInWorkspace(actor, fit, "fit"); // fit is non-null after this
 */
export function assertInWorkspace<T extends { workspaceId: string } | string>(
  actor: Pick<Actor, "workspaceId">,
  object: T | null | undefined,
  what = "item",
): asserts object is T {
  const workspaceId = typeof object === "string" ? object : object?.workspaceId;
  if (!workspaceId || workspaceId !== actor.workspaceId) {
    throw new AppError(`not_found:${what}`, `No such ${what} in this workspace.`);
  }
}
