import { z } from "zod";

const amounts = z.record(z.string().min(1), z.number({ error: "Give each amount as a number." }));

const planFields = {
  /** Spend per channel for the whole horizon, in the workspace currency. */
  allocation: amounts,
  /** Controls over the horizon: a count of periods for on/off controls, a per-period value otherwise. */
  controls: amounts.default({}),
  /** Number of periods (e.g. weeks) the amounts cover. */
  horizon: z.number().int("The horizon is a whole number of periods.").min(1).max(520),
};

export const predictRequestSchema = z.object({
  ...planFields,
  /** Confidence level of both intervals; default the fit's own (usually 0.95). */
  level: z.number().gt(0.5, "Use a level above 0.5.").lt(1, "Use a level below 1.").optional(),
  /** Another plan (e.g. the starting allocation): the response then has `difference` with its own interval. */
  compareTo: z.object(planFields).optional(),
});
export type PredictRequest = z.input<typeof predictRequestSchema>;
