import "server-only";
import { eq } from "drizzle-orm";
import { fits, type FitRow } from "@/db/schema";
import type { Actor } from "@/server/authz/actor";
import { recordAudit, type DbExecutor } from "@/server/data/audit";
import { AppError, postgresCode } from "@/server/errors";
import { lockFitRow } from "./store";
import type { FitDto, FitStatus } from "./types";

const labels: Record<FitStatus, string> = {
  draft: "a draft",
  in_review: "in review",
  changes_requested: "waiting for changes",
  approved: "approved",
  retired: "retired",
};

/** The database's freeze triggers raise restrict_violation (23001); the API calls it a conflict. */
export function frozenConflict(error: unknown): AppError | null {
  if (postgresCode(error) !== "23001") return null;
  const message = error instanceof Error ? (error.cause instanceof Error ? error.cause.message : error.message) : String(error);
  return new AppError("conflict:frozen", "This fit is approved or retired, so its numbers and data are frozen.", {
    details: [{ path: "", message: message.split("\n")[0] }],
  });
}

type TransitionPlan = {
  permission: "fit:submit" | "fit:review" | "fit:retire";
  to: FitStatus;
  action: string;
  /** Throws when the transition is not allowed for this actor on this fit. */
  check: (row: FitRow, userId: string) => void;
  set: (row: FitRow, userId: string, now: Date) => Partial<typeof fits.$inferInsert>;
};

export const fitTransitionPlans = {
  submit: {
    permission: "fit:submit",
    to: "in_review",
    action: "fit.submitted",
    check(row, userId) {
      if (row.status !== "draft" && row.status !== "changes_requested") {
        throw new AppError("conflict:fit_state", `This fit is ${labels[row.status]}; only a draft, or a fit with changes requested, can be sent for review.`);
      }
      if (row.authorId !== userId) throw new AppError("forbidden:not_author", "Only the analyst who built this fit can send it for review.");
    },
    set: (_row, _actor, now) => ({ status: "in_review", submittedAt: now }),
  },
  approve: {
    permission: "fit:review",
    to: "approved",
    action: "fit.approved",
    check(row, userId) {
      if (row.status !== "in_review") throw new AppError("conflict:fit_state", `This fit is ${labels[row.status]}; only a fit in review can be approved.`);
      if (row.authorId === userId) {
        throw new AppError("forbidden:self_approval", "You built this fit, so someone else must approve it (separation of duties).");
      }
    },
    set: (_row, userId, now) => ({ status: "approved", approvedAt: now, approvedBy: userId }),
  },
  "request-changes": {
    permission: "fit:review",
    to: "changes_requested",
    action: "fit.changes_requested",
    check(row) {
      if (row.status !== "in_review") {
        throw new AppError("conflict:fit_state", `This fit is ${labels[row.status]}; changes can only be requested on a fit in review.`);
      }
    },
    set: () => ({ status: "changes_requested" }),
  },
  retire: {
    permission: "fit:retire",
    to: "retired",
    action: "fit.retired",
    check(row) {
      if (row.status === "retired") throw new AppError("conflict:fit_state", "This fit is already retired.");
    },
    set: (_row, userId, now) => ({ status: "retired", retiredAt: now, retiredBy: userId }),
  },
} satisfies Record<string, TransitionPlan>;

export type FitAction = keyof typeof fitTransitionPlans;

/**
 * The state change itself, inside the caller's transaction: row lock, workspace (404), rules
 * (403/409), update and audit entry. Returns the row as it was before. No permission check and no
 * e-mail: transitionFit adds both; the seed calls this directly.
 */
export async function applyFitTransition(
  tx: DbExecutor,
  input: { workspaceId: string; userId: string; fitId: string; action: FitAction; comment: string | null },
): Promise<FitRow> {
  const plan: TransitionPlan = fitTransitionPlans[input.action];
  const row = await lockFitRow(tx, input.fitId);
  // Another workspace's fit does not exist for this caller (404, as assertInWorkspace says it).
  if (!row || row.workspaceId !== input.workspaceId) throw new AppError("not_found:fit", "No such fit in this workspace.");
  plan.check(row, input.userId);
  const now = new Date();
  await tx.update(fits).set({ ...plan.set(row, input.userId, now), updatedAt: now }).where(eq(fits.id, row.id));
  await recordAudit(
    {
      workspaceId: input.workspaceId,
      actorUserId: input.userId,
      action: plan.action,
      objectType: "fit",
      objectId: row.id,
      details: { name: row.name, from: row.status, to: plan.to, ...(input.comment ? { comment: input.comment } : {}), checksum: row.recordChecksum },
    },
    tx,
  );
  return row;
}

/** Which actions this actor may take on this fit now (for buttons; the server checks again). */
export function availableFitActions(fit: Pick<FitDto, "status" | "authorId">, actor: Pick<Actor, "userId" | "permissions">): FitAction[] {
  const result: FitAction[] = [];
  const has = (permission: TransitionPlan["permission"]) => actor.permissions.has(permission);
  if ((fit.status === "draft" || fit.status === "changes_requested") && has("fit:submit") && fit.authorId === actor.userId) result.push("submit");
  if (fit.status === "in_review" && has("fit:review")) {
    if (fit.authorId !== actor.userId) result.push("approve");
    result.push("request-changes");
  }
  if (fit.status !== "retired" && has("fit:retire")) result.push("retire");
  return result;
}
