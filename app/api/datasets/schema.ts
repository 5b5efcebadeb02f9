import { z } from "zod";

export { uploadOptionsSchema } from "@/server/datasets/upload-request";

/** GET /api/datasets: newest first. */
export const datasetListQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
