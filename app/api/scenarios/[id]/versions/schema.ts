import { z } from "zod";

const amounts = z.record(z.string().min(1), z.number({ error: "Give each amount as a number." }));
const cents = z.number().int().min(0);

export const saveVersionRequestSchema = z.object({
  /** The version you started from (0 before the first save). A newer version existing → 409. */
  baseVersion: z.number({ error: "Say which version you started from (baseVersion, 0 for none)." }).int().min(0),
  note: z.string().max(2000, "Keep the note under 2,000 characters.").optional(),
  /** Save a copy of this older version as the new one (plan fields are then ignored). */
  restoreFrom: z.number().int().min(1).optional(),
  mode: z.enum(["fixed", "growing"], { error: 'mode is "fixed" or "growing".' }).optional(),
  /** Amount per channel for the whole horizon, in the workspace currency. */
  allocation: amounts.optional(),
  total: z.number().optional(),
  ceiling: z.number().nullable().optional(),
  horizon: z.number().int().min(1).max(520).optional(),
  controls: amounts.optional(),
  /** Per channel: locked, and floor/ceiling in cents for the horizon. */
  settings: z
    .record(z.string().min(1), z.object({ locked: z.boolean().optional(), floorCents: cents.optional(), ceilingCents: cents.optional() }))
    .optional(),
});
export type SaveVersionRequest = z.input<typeof saveVersionRequestSchema>;
