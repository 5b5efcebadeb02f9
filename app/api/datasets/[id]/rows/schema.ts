import { z } from "zod";

/** GET /api/datasets/{id}/rows: rows offset+1 … offset+limit in file order. */
export const rowsQuerySchema = z.object({
  offset: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(1000).default(100),
});
