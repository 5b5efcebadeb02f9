import "server-only";
import type { UploadProgress } from "./pipeline";
import { deleteStagedUpload, getStagedUpload, readStagedUpload, StagedUploadAborted, type StagedUpload } from "./staging";
import { createDataset, type CreateDatasetResult } from "./store";
import { recordDatasetUploaded } from "./upload-audit";

/**
 * The dataset.ingest job's work: read a staged upload (following it while it still arrives), parse,
 * check and store it with createDataset (one transaction, audit entry included; the dataset adopts the
 * staged bytes as its original file), then delete the upload, and its bytes unless adopted, whatever happened. A bad file resolves `{ ok: false, report }`; an interrupted upload
 * rejects with StagedUploadAborted. Either way nothing of it is stored.
 */
export async function ingestStagedUpload(
  uploadId: string,
  options: { onProgress?: (progress: UploadProgress) => void; stallMs?: number; pollMs?: number } = {},
): Promise<CreateDatasetResult & { upload: StagedUpload }> {
  const upload = await getStagedUpload(uploadId);
  if (!upload) throw new StagedUploadAborted("The upload is no longer there (it was interrupted or already processed).");
  // after COMMIT the upload's row is removed while the stored dataset is read back
  const removal: { started: Promise<void> | null } = { started: null };
  try {
    const result = await createDataset({
      workspaceId: upload.workspaceId,
      userId: upload.createdBy,
      name: upload.name ?? undefined,
      originalFilename: upload.originalFilename,
      stream: readStagedUpload(uploadId, { stallMs: options.stallMs, pollMs: options.pollMs }),
      options: upload.options,
      totalBytes: upload.declaredBytes,
      onProgress: options.onProgress,
      // the original bytes are in dataset_files already, under the upload's id: the dataset takes it
      adoptFileOf: uploadId,
      beforeCommit: (tx, datasetId) => recordDatasetUploaded(tx, { datasetId, actorUserId: upload.createdBy, via: "background" }),
      afterCommit: () => {
        removal.started = deleteStagedUpload(uploadId);
        removal.started.catch(() => {});
      },
    });
    return { ...result, upload };
  } finally {
    await (removal.started ?? deleteStagedUpload(uploadId));
  }
}
