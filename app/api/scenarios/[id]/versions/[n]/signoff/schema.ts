import { z } from "zod";

export const signoffRequestSchema = z
  .object({
    decision: z.enum(["signed_off", "declined"], { error: 'decision is "signed_off" or "declined".' }),
    /** Required to decline; an optional remark when signing off. */
    reason: z.string().max(4000, "Keep the reason under 4,000 characters.").nullable().optional(),
  })
  .superRefine((value, context) => {
    if (value.decision === "declined" && !(value.reason ?? "").trim()) {
      context.addIssue({ code: "custom", path: ["reason"], message: "Say why you decline this version." });
    }
  });
export type SignoffRequest = z.input<typeof signoffRequestSchema>;
