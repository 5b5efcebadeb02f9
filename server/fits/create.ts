import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { fits } from "@/db/schema";
import { assertInWorkspace, requirePermission, type Actor } from "@/server/authz/actor";
import { AppError } from "@/server/errors";
import { enqueueJob, type JobRunDto } from "@/server/jobs/runs";
import { assertRefittable, executeFit, inlineFitRowLimit, prepareFit, storeComputedFit, type FitJobInput } from "./run";
import { getFitById } from "./store";
import type { FitDto, FitInput } from "./types";

export type CreateFitResult = { kind: "done"; fit: FitDto } | { kind: "queued"; job: JobRunDto };

/**
 * POST /api/fits and PUT /api/fits/{id}: fits small datasets at once, queues large ones for the worker.
 *
 * @throws AppError 403 (role, not the author), 404 (refit of another workspace's fit), 409 (state,
 *   dataset without roles), 422 (the request or the engine refuses)
 */
export async function createOrRefitFit(actor: Actor, input: FitInput, fitId: string | null = null): Promise<CreateFitResult> {
  requirePermission(actor, "fit:create");
  if (fitId !== null) {
    const [row] = await db.select({ workspaceId: fits.workspaceId, status: fits.status, authorId: fits.authorId }).from(fits).where(eq(fits.id, fitId));
    assertInWorkspace(actor, row, "fit");
    assertRefittable(row, actor.userId);
  }
  const prepared = await prepareFit(actor.workspaceId, input);
  if (prepared.dataset.rowCount > inlineFitRowLimit()) {
    const jobInput: FitJobInput = { fitInput: input, userId: actor.userId, fitId };
    const job = await enqueueJob({ workspaceId: actor.workspaceId, userId: actor.userId, kind: "fit.run", input: jobInput as unknown as Record<string, unknown> });
    return { kind: "queued", job };
  }
  const computed = await executeFit(prepared, input);
  const id = await storeComputedFit({ workspaceId: actor.workspaceId, userId: actor.userId, fitId, input, specification: prepared.specification, computed });
  const fit = await getFitById(id);
  if (!fit) throw new AppError("internal", "The fit was stored but could not be read back.");
  return { kind: "done", fit };
}
