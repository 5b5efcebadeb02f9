import "server-only";
import { executeFit, prepareFit, storeComputedFit, type FitJobInput } from "@/server/fits/run";
import type { JobHandler } from "./index";

/**
 * `fit.run`: a fit of a large dataset, in the worker. Re-checks the request against the dataset
 * (it may have changed since it was queued), reads the rows, fits, and stores a draft (or the new
 * numbers of a refitted draft). The result names the fit; refusals fail the run with the same
 * message and details the API would have given.
 */
const runFit: JobHandler = async ({ run, progress }) => {
  const { fitInput, userId, fitId } = run.input as unknown as FitJobInput;
  await progress("Checking the request", 0, 3);
  const prepared = await prepareFit(run.workspaceId, fitInput);
  let step = 1;
  const computed = await executeFit(prepared, fitInput, (phase) => progress(phase, step++, 3));
  await progress("Storing the fit", 3, 3);
  const id = await storeComputedFit({ workspaceId: run.workspaceId, userId, fitId, input: fitInput, specification: prepared.specification, computed });
  return { fitId: id, n: computed.report.n, rSquared: computed.report.rSquared };
};

export default runFit;
