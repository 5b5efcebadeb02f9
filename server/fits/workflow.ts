import "server-only";
import { db } from "@/db/client";
import type { FitRow } from "@/db/schema";
import { requirePermission, type Actor } from "@/server/authz/actor";
import { AppError } from "@/server/errors";
import { notifyFitTransition, transitionOf } from "./mail";
import { getFitById } from "./store";
import { applyFitTransition, fitTransitionPlans, frozenConflict, type FitAction } from "./transitions";
import type { FitDto, FitStatus } from "./types";
import { invalidateFitCache } from "@/server/predict/fit-cache";

export { availableFitActions, type FitAction } from "./transitions";

/**
 * Moves a fit along draft → in review → approved or changes requested → … → retired, under a row
 * lock, writing the audit entry in the same transaction, then e-mails the author and the reviewers.
 *
 * @throws AppError 404 (missing or another workspace's), 403 (role; author rules), 409 (state),
 *   422 (a request for changes without a comment)
 */
export async function transitionFit(input: { actor: Actor; fitId: string; action: FitAction; comment?: string | null }): Promise<FitDto> {
  const plan = fitTransitionPlans[input.action];
  const { actor } = input;
  requirePermission(actor, plan.permission);
  const comment = input.comment?.trim() || null;
  if (input.action === "request-changes" && !comment) {
    throw new AppError("invalid:comment", "Say what should change: a request for changes needs a comment.", {
      details: [{ path: "comment", message: "Required when requesting changes" }],
    });
  }
  let before: FitRow;
  try {
    before = await db.transaction((tx) =>
      applyFitTransition(tx, { workspaceId: actor.workspaceId, userId: actor.userId, fitId: input.fitId, action: input.action, comment }),
    );
  } catch (error) {
    throw frozenConflict(error) ?? error;
  }
  // Predictions in this process see the new status at once (other processes within HEAD_TTL_MS).
  invalidateFitCache(input.fitId);
  await notifyFitTransition({
    workspaceId: actor.workspaceId,
    workspaceName: actor.workspaceName,
    fitId: before.id,
    fitName: before.name,
    authorId: before.authorId,
    actorUserId: actor.userId,
    actorName: actor.name ?? actor.email,
    transition: transitionOf[fitTransitionPlans[input.action].to as Exclude<FitStatus, "draft">],
    comment,
  });
  const after = await getFitById(before.id);
  if (!after) throw new AppError("not_found:fit", "No such fit in this workspace.");
  return after;
}

