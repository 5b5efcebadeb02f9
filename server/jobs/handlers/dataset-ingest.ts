import "server-only";
import { ingestStagedUpload } from "@/server/datasets/ingest";
import { reportToErrorBody } from "@/server/datasets/problems";
import { cleanupStaleUploads, StagedUploadAborted } from "@/server/datasets/staging";
import type { JobHandler } from "./index";

/**
 * `dataset.ingest`: a large upload staged by POST /api/datasets. Follows the staged chunks while they
 * still arrive, parses, checks and stores the dataset in one transaction (createDataset), reporting
 * "Checking rows" progress in bytes, then removes the staged bytes. A bad file fails the run with the
 * same report (every problem with row and column) the API gives inline; an interrupted upload fails
 * it with the reason. Nothing is stored in either case.
 */
const PROGRESS_EVERY_MS = 200;
/** …or whenever another 5% of the file has been read, so a small file that reads in a blink still shows steps. */
const PROGRESS_EVERY_FRACTION = 0.05;

const ingestDataset: JobHandler = async ({ run, progress }) => {
  const { uploadId } = run.input as { uploadId: string };
  await cleanupStaleUploads().catch(() => 0);
  await progress("Checking rows", 0, null, "Waiting for the first bytes");
  let pending: Promise<void> = Promise.resolve();
  let lastPhase: string | null = null;
  let lastAt = 0;
  let lastBytes = 0;
  const result = await ingestStagedUpload(uploadId, {
    onProgress: (p) => {
      // the reader reports every 64 KB (about 1,500 times for 100 MB): pass on a new phase at once and
      // the rest a few times a second, before any formatting (toLocaleString is not cheap)
      const now = Date.now();
      const step = p.totalBytes ? (p.bytesRead - lastBytes) / p.totalBytes : 0;
      if (p.phase === lastPhase && now - lastAt < PROGRESS_EVERY_MS && step < PROGRESS_EVERY_FRACTION) return;
      lastPhase = p.phase;
      lastAt = now;
      lastBytes = p.bytesRead;
      const message =
        p.phase === "storing"
          ? `Storing ${p.rowsParsed.toLocaleString("en")} rows`
          : `${p.rowsParsed.toLocaleString("en")} rows checked`;
      // keep one write in flight at a time
      pending = pending.then(() => progress(p.phase === "storing" ? "Storing" : "Checking rows", p.bytesRead, p.totalBytes, message)).catch(() => {});
    },
  }).catch((error: unknown) => {
    if (error instanceof StagedUploadAborted) throw new Error(`${error.reason} Nothing was stored.`);
    throw error;
  });
  await pending;
  if (!result.ok) {
    const body = reportToErrorBody(result.report);
    throw Object.assign(new Error(body.error), { details: body.details });
  }
  const { dataset } = result;
  await progress("Stored", dataset.byteSize, dataset.byteSize, `${dataset.rowCount.toLocaleString("en")} rows stored`);
  return {
    datasetId: dataset.id,
    name: dataset.name,
    status: dataset.status,
    rowCount: dataset.rowCount,
    columnCount: dataset.columnCount,
    sha256: dataset.sha256,
    notes: result.report.notes,
  };
};

export default ingestDataset;
