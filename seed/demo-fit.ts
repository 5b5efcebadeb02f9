import { Readable } from "node:stream";
import { and, eq, inArray } from "drizzle-orm";
import type { Database } from "@/db/client";
import { datasets, fits } from "@/db/schema";
import { assignDatasetRoles, createDataset } from "@/server/datasets/store";
import { executeFit, prepareFit, storeComputedFit } from "@/server/fits/run";
import { applyFitTransition } from "@/server/fits/transitions";
import type { FitInput, FitStatus } from "@/server/fits/types";
import { demoAccountFor } from "./demo-accounts";
import { demoApprovedFitName, demoDatasetName, demoDraftFitName } from "./demo-names";
import { demoWorkspaceId, userIdByEmail } from "./lookup";
import { demoChannels, demoControl, demoHistoryCsv, demoOutcome, demoPeriod } from "./history";

type Db = Database["db"];

export { demoApprovedFitName, demoDatasetName, demoDraftFitName };

function demoFitInput(datasetId: string, name: string, channels: readonly string[]): FitInput {
  return {
    datasetId,
    name,
    outcome: demoOutcome.column,
    terms: [
      ...channels.map((column) => ({ column, transform: "none" as const, role: "spend" as const })),
      { column: demoControl.column, transform: "none", role: "control" },
    ],
    interactions: [],
    intercept: true,
    level: 0.95,
    covariance: { type: "classical" },
  };
}

async function ensureDemoDataset(db: Db, workspaceId: string, analystId: string): Promise<string> {
  const [existing] = await db
    .select({ id: datasets.id })
    .from(datasets)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.name, demoDatasetName)));
  if (existing) return existing.id;
  const roles: Record<string, { role: "outcome" | "spend" | "control" | "period"; unit?: string }> = {
    [demoPeriod.column]: { role: "period" },
    [demoOutcome.column]: { role: "outcome", unit: demoOutcome.unit },
    [demoControl.column]: { role: "control", unit: demoControl.unit },
  };
  for (const channel of demoChannels) roles[channel.column] = { role: "spend", unit: channel.unit };
  // Upload first, then assign roles: the two steps an analyst takes in the browser.
  const upload = await createDataset({
    workspaceId,
    userId: analystId,
    name: demoDatasetName,
    originalFilename: "larkspur-weekly-history.csv",
    stream: Readable.from([Buffer.from(demoHistoryCsv(), "utf8")]),
  });
  if (!upload.ok) throw new Error(`seed: the demo history was refused: ${upload.report.problems.map((p) => p.message).join("; ")}`);
  const assigned = await assignDatasetRoles({ workspaceId, datasetId: upload.dataset.id, userId: analystId, roles });
  if (!assigned?.ok) throw new Error(`seed: the demo history's roles were refused: ${assigned?.report.problems.map((p) => p.message).join("; ")}`);
  return upload.dataset.id;
}

async function ensureFit(
  db: Db,
  input: { workspaceId: string; analystId: string; fitInput: FitInput; existingStatuses: FitStatus[] },
): Promise<{ id: string; status: string; created: boolean }> {
  // Only fits the seed could have made count: a person's own draft of the same name is left alone.
  const [existing] = await db
    .select({ id: fits.id, status: fits.status })
    .from(fits)
    .where(
      and(
        eq(fits.workspaceId, input.workspaceId),
        eq(fits.name, input.fitInput.name!),
        eq(fits.authorId, input.analystId),
        inArray(fits.status, input.existingStatuses),
      ),
    )
    .orderBy(fits.createdAt)
    .limit(1);
  if (existing) return { ...existing, created: false };
  const prepared = await prepareFit(input.workspaceId, input.fitInput);
  const computed = await executeFit(prepared, input.fitInput);
  const id = await storeComputedFit({
    workspaceId: input.workspaceId,
    userId: input.analystId,
    fitId: null,
    input: input.fitInput,
    specification: prepared.specification,
    computed,
  });
  return { id, status: "draft", created: true };
}

/**
 * The demo spend history (uploaded by the analyst) and two fits on it: an APPROVED fit on all six
 * channels and the promotion control (built by the analyst, approved by the reviewer, each step in
 * the audit log), and a DRAFT without online video, where display takes video's credit. Online video
 * and display move together, so the approved fit's collinearity section warns about them (VIF > 10).
 * Idempotent: finds the dataset and fits by name and creates only what is missing.
 */
export async function seedDemoFit(db: Db): Promise<void> {
  const workspace = { id: await demoWorkspaceId(db) };
  const analystId = await userIdByEmail(db, demoAccountFor("analyst").email);
  const reviewerId = await userIdByEmail(db, demoAccountFor("reviewer").email);
  const datasetId = await ensureDemoDataset(db, workspace.id, analystId);
  const channels = demoChannels.map((channel) => channel.column);

  // An interrupted earlier seed may have left it on the way (draft or in review): pick it up there.
  const approved = await ensureFit(db, {
    workspaceId: workspace.id,
    analystId,
    fitInput: demoFitInput(datasetId, demoApprovedFitName, channels),
    existingStatuses: ["approved", "retired", "in_review", "draft"],
  });
  const steps: { status: string; action: "submit" | "approve"; userId: string; comment: string | null }[] = [
    { status: "draft", action: "submit", userId: analystId, comment: "All six channels plus promotion weeks, classical errors (Durbin–Watson is near 2)." },
    {
      status: "in_review",
      action: "approve",
      userId: reviewerId,
      comment: "Residuals look fine. Video and display move together (VIF ≈ 19): read their split with care.",
    },
  ];
  for (const step of steps) {
    const [row] = await db.select({ status: fits.status }).from(fits).where(eq(fits.id, approved.id));
    if (row.status !== step.status) continue;
    await db.transaction((tx) =>
      applyFitTransition(tx, { workspaceId: workspace.id, userId: step.userId, fitId: approved.id, action: step.action, comment: step.comment }),
    );
  }

  const draft = await ensureFit(db, {
    workspaceId: workspace.id,
    analystId,
    fitInput: demoFitInput(
      datasetId,
      demoDraftFitName,
      channels.filter((column) => column !== "video_eur"),
    ),
    existingStatuses: ["draft", "in_review", "changes_requested", "approved", "retired"],
  });
  console.log(`demo fit: dataset ${datasetId}; approved fit ${approved.id}${approved.created ? " (new)" : ""}; draft ${draft.id}${draft.created ? " (new)" : ""}`);
}
