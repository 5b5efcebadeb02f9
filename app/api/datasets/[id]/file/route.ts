import { AppError } from "@/server/errors";
import { readDatasetFile } from "@/server/datasets/store";
import { apiRoute, idParams } from "@/server/http/route";
import { attachment } from "@/server/datasets/download";

/** The original file, byte for byte as uploaded (its sha256 in the Repr-Digest header). */
export const GET = apiRoute({ permission: "dataset:read", params: idParams }, async ({ actor, params }) => {
  const file = await readDatasetFile({ workspaceId: actor.workspaceId, datasetId: params.id });
  if (!file) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  const chunks = file.chunks[Symbol.asyncIterator]();
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      const next = await chunks.next();
      if (next.done) controller.close();
      else controller.enqueue(new Uint8Array(next.value.buffer, next.value.byteOffset, next.value.byteLength));
    },
    async cancel() {
      await chunks.return?.();
    },
  });
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Length": String(file.byteSize),
      "Content-Disposition": attachment(file.filename),
      "Repr-Digest": `sha-256=:${Buffer.from(file.sha256, "hex").toString("base64")}:`,
      "X-Content-SHA256": file.sha256,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
});
