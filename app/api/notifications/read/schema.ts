import { z } from "zod";

export const markReadRequestSchema = z
  .object({
    ids: z.array(z.uuid("Each id must be a notification's id.")).max(500).optional(),
    all: z.boolean().optional(),
  })
  .refine((value) => value.all === true || (value.ids?.length ?? 0) > 0, { message: "Give the ids to mark read, or all: true.", path: ["ids"] });
