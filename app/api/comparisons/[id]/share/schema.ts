import { z } from "zod";

export const shareRequestSchema = z.object({
  /** Finance members of the workspace, by user id or e-mail address. */
  recipients: z.array(z.string().trim().min(1).max(320)).min(1, "Choose at least one finance member to share with.").max(50),
  note: z.string().max(2000, "Keep the note under 2,000 characters.").optional(),
  /** Required when a shared version carries extrapolation warnings (422 without it). */
  acknowledgement: z.string().max(2000, "Keep the acknowledgement under 2,000 characters.").nullable().optional(),
});
export type ShareRequest = z.input<typeof shareRequestSchema>;
