import "server-only";
import { executeFit, prepareFit, storeComputedFit, type FitJobInput, type FitStage } from "@/server/fits/run";
import type { JobHandler } from "./index";

/**
 * `fit.run`: a fit of a large dataset, in the worker. Re-checks the request against the dataset
 * (it may have changed since it was queued), reads the rows, fits, and stores a draft (or the new
 * numbers of a refitted draft). The result names the fit; refusals fail the run with the same
 * message and details the API would have given.
 *
 * Progress is on a scale of 0 to 100 so the browser's bar moves through every stage: checking the
 * request (0), reading the rows column by column (5 to 60), solving (60), diagnostics (80), storing
 * (90), stored (100).
 */
export const FIT_PROGRESS_TOTAL = 100;

const count = (n: number) => n.toLocaleString("en");

function stageProgress(stage: FitStage): { phase: string; done: number; message: string } {
  switch (stage.stage) {
    case "reading":
      return {
        phase: "Reading rows",
        done: 5 + (stage.columns > 0 ? Math.round((55 * stage.columnsRead) / stage.columns) : 0),
        message:
          stage.columns > 0
            ? `${count(stage.rows)} rows: ${stage.columnsRead} of ${stage.columns} columns read`
            : `${count(stage.rows)} rows`,
      };
    case "solving":
      return { phase: "Solving", done: 60, message: `${count(stage.rows)} rows, ${stage.terms} terms` };
    case "diagnostics":
      return { phase: "Diagnostics", done: 80, message: `Residuals, influence and plots of ${count(stage.rows)} rows` };
  }
}

const runFit: JobHandler = async ({ run, progress }) => {
  const { fitInput, userId, fitId } = run.input as unknown as FitJobInput;
  await progress("Checking the request", 0, FIT_PROGRESS_TOTAL);
  const prepared = await prepareFit(run.workspaceId, fitInput);
  const computed = await executeFit(prepared, fitInput, async (stage) => {
    const { phase, done, message } = stageProgress(stage);
    await progress(phase, done, FIT_PROGRESS_TOTAL, message);
  });
  await progress("Storing", 90, FIT_PROGRESS_TOTAL, "Saving the draft fit");
  const id = await storeComputedFit({ workspaceId: run.workspaceId, userId, fitId, input: fitInput, specification: prepared.specification, computed });
  await progress("Stored", FIT_PROGRESS_TOTAL, FIT_PROGRESS_TOTAL, `n = ${count(computed.report.n)}`);
  return { fitId: id, n: computed.report.n, rSquared: computed.report.rSquared };
};

export default runFit;
