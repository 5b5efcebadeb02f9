import { z } from "zod";

/** Path of the routes under /api/scenarios/{id}/versions/{n}/… */
export const versionParams = z.object({ id: z.uuid(), n: z.coerce.number().int().min(1).max(2_147_483_647) });

export const postCommentRequestSchema = z.object({
  /** Plain text; `@Full Name` or `@e-mail` mentions a member (who is e-mailed). */
  body: z.string().trim().min(1, "Write a comment first.").max(4000, "Keep a comment under 4,000 characters."),
  /** Reply to this comment (on the same version). */
  parentId: z.uuid("parentId must be a comment's id.").nullable().optional(),
  /** The comparison the comment is written in (notifications link back to it). */
  comparisonId: z.uuid("comparisonId must be a comparison's id.").nullable().optional(),
});
export type PostCommentRequest = z.input<typeof postCommentRequestSchema>;
