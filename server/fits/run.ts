import "server-only";
import { db } from "@/db/client";
import { recordAudit } from "@/server/data/audit";
import { getDatasetById, loadDatasetFrame, type DatasetDto } from "@/server/datasets/store";
import { AppError } from "@/server/errors";
import { type ModelSpecification, predictorColumns } from "@/server/stats";
import { describeFit, solveFit, type ComputedFit } from "./compute";
import { designColumnCount, specificationFromInput } from "./specification";
import { insertDraftFit, lockFitRow, updateFitNumbers } from "./store";
import type { FitInput } from "./types";
import { frozenConflict } from "./transitions";

/**
 * Datasets up to this many rows are fitted inside the request (well under a second); larger ones
 * go to the worker so the web server keeps answering during a long fit. FIT_INLINE_ROW_LIMIT
 * overrides it (tests use a small value to exercise the job path).
 */
export function inlineFitRowLimit(): number {
  const raw = process.env.FIT_INLINE_ROW_LIMIT?.trim();
  const configured = raw ? Number(raw) : NaN;
  return Number.isInteger(configured) && configured >= 0 ? configured : 50_000;
}

/** What a fit job carries (job_runs.input): everything needed to redo the request without a session. */
export type FitJobInput = { fitInput: FitInput; userId: string; fitId: string | null };

type Prepared = { dataset: DatasetDto; specification: ModelSpecification };

/** Checks the dataset (this workspace's, with roles) and the request against it; cheap, no rows read. */
export async function prepareFit(workspaceId: string, input: FitInput): Promise<Prepared> {
  const dataset = await getDatasetById({ workspaceId, datasetId: input.datasetId });
  if (!dataset) {
    throw new AppError("invalid:dataset", "No such spend history in this workspace.", { details: [{ path: "datasetId", message: "Not found" }] });
  }
  if (dataset.status !== "ready") {
    throw new AppError("conflict:dataset_roles", "Assign the column roles of this spend history (outcome, spend, controls) before fitting it.", {
      details: [{ path: "datasetId", message: "The dataset's column roles are not assigned yet" }],
    });
  }
  const specification = specificationFromInput(
    input,
    dataset.columns.map((column) => ({ name: column.name, role: column.role ?? "ignored", unit: column.unit })),
  );
  const usableRows = dataset.rowCount - dataset.droppedRowCount;
  const terms = designColumnCount(input);
  if (usableRows <= terms) {
    throw new AppError("invalid:fit", `The fit needs more rows than terms: this spend history has ${usableRows} usable rows and the model has ${terms} terms.`, {
      details: [{ path: "terms", message: `n = ${usableRows} is not more than the number of terms (${terms})` }],
    });
  }
  return { dataset, specification };
}

/** Where a fit in progress is, for a job's progress bar. */
export type FitStage =
  | { stage: "reading"; columnsRead: number; columns: number; rows: number }
  | { stage: "solving"; rows: number; terms: number }
  | { stage: "diagnostics"; rows: number };

/** Reads the rows the fit uses and fits them (the slow part: seconds for a million rows). */
export async function executeFit(prepared: Prepared, input: FitInput, onStage?: (stage: FitStage) => Promise<void>): Promise<ComputedFit> {
  const { dataset, specification } = prepared;
  // column reads finish in parallel: their reports are written one after the other, in order
  let reported: Promise<void> = Promise.resolve();
  const report = (stage: FitStage) => {
    if (onStage) reported = reported.then(() => onStage(stage));
    return reported;
  };
  await report({ stage: "reading", columnsRead: 0, columns: 0, rows: dataset.rowCount });
  const frame = await loadDatasetFrame(dataset.id, {
    workspaceId: dataset.workspaceId,
    columns: [specification.outcome, ...predictorColumns(specification)],
    onColumnRead: (columnsRead, columns, rows) => void report({ stage: "reading", columnsRead, columns, rows }).catch(() => {}),
  });
  await reported;
  if (!frame) throw new AppError("invalid:dataset", "No such spend history in this workspace.");
  await report({ stage: "solving", rows: frame.n, terms: designColumnCount(input) });
  const units = Object.fromEntries(dataset.columns.map((column) => [column.name, column.unit]));
  const period = dataset.columns.find((column) => column.role === "period");
  const fitInput = {
    specification,
    columns: frame.columns,
    level: input.level,
    covariance: input.covariance,
    periodColumn: period?.name ?? null,
    periodLabels: frame.periods,
    rowNumbers: frame.rowNumbers,
    units,
  };
  const solved = solveFit(fitInput);
  await report({ stage: "diagnostics", rows: frame.n });
  return describeFit(fitInput, solved);
}

export function defaultFitName(input: FitInput): string {
  const spend = input.terms.filter((t) => t.role === "spend").length;
  const controls = input.terms.length - spend;
  const parts = [`${spend} channel${spend === 1 ? "" : "s"}`];
  if (controls) parts.push(`${controls} control${controls === 1 ? "" : "s"}`);
  if (input.interactions.length) parts.push(`${input.interactions.length} interaction${input.interactions.length === 1 ? "" : "s"}`);
  return `${input.outcome} on ${parts.join(", ")}`;
}

/** Stores a computed fit: a new draft, or new numbers for an existing draft (a refit). */
export async function storeComputedFit(params: {
  workspaceId: string;
  userId: string;
  fitId: string | null;
  input: FitInput;
  specification: ModelSpecification;
  computed: ComputedFit;
}): Promise<string> {
  const numbers = { specification: params.specification, input: params.input, level: params.input.level, covariance: params.input.covariance, ...params.computed };
  const name = params.input.name ?? defaultFitName(params.input);
  if (params.fitId === null) {
    return insertDraftFit({ ...numbers, workspaceId: params.workspaceId, datasetId: params.input.datasetId, name, authorId: params.userId });
  }
  const fitId = params.fitId;
  try {
    await db.transaction(async (tx) => {
      const row = await lockFitRow(tx, fitId);
      if (!row || row.workspaceId !== params.workspaceId) throw new AppError("not_found:fit", "No such fit in this workspace.");
      assertRefittable(row, params.userId);
      await updateFitNumbers(tx, { ...numbers, id: fitId, datasetId: params.input.datasetId, name });
      await recordAudit(
        {
          workspaceId: params.workspaceId,
          actorUserId: params.userId,
          action: "fit.refitted",
          objectType: "fit",
          objectId: fitId,
          details: { name, from: row.status, to: row.status, checksum: numbers.record.checksum },
        },
        tx,
      );
    });
  } catch (error) {
    throw frozenConflict(error) ?? error;
  }
  return fitId;
}

export function assertRefittable(row: { status: string; authorId: string | null }, userId: string) {
  if (row.status !== "draft" && row.status !== "changes_requested") {
    throw new AppError("conflict:fit_state", "Only a draft, or a fit with changes requested, can be refitted; build a new fit instead.");
  }
  if (row.authorId !== userId) throw new AppError("forbidden:not_author", "Only the analyst who built this fit can refit it.");
}

