import { z } from "zod";

export const reviewRequestSchema = z
  .object({
    decision: z.enum(["approve", "request-changes"]),
    comment: z.string().trim().max(4000).optional(),
  })
  .strict()
  .refine((body) => body.decision === "approve" || (body.comment ?? "").length > 0, {
    path: ["comment"],
    message: "Say what should change: a request for changes needs a comment",
  });

/** Submit and retire take an optional comment (an empty body is fine). */
export const commentRequestSchema = z
  .object({ comment: z.string().trim().max(4000).optional() })
  .strict()
  .optional()
  .transform((body) => body ?? {});
