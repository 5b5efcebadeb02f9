import { z } from "zod";

const amounts = z.record(z.string().min(1), z.number({ error: "Give each amount as a number." }));

export const startScenarioRequestSchema = z.object({
  fitId: z.uuid("Name the approved fit to plan on (fitId)."),
  name: z.string().trim().min(1, "Give the scenario a name.").max(200, "Use at most 200 characters."),
  /** Periods the plan covers; default a quarter of a year in the fit's periods (13 weeks). */
  horizon: z.number().int("The horizon is a whole number of periods.").min(1).max(520).optional(),
  /** Controls over the horizon (count of periods for on/off controls, per-period value otherwise). */
  controls: amounts.optional(),
  /** Starting amounts per channel for the whole horizon; default the spend of the most recent horizon. */
  allocation: amounts.optional(),
  /** Start from a saved version of another scenario on the same fit instead. */
  startFrom: z.object({ scenarioId: z.uuid(), version: z.number().int().min(1) }).optional(),
});
export type StartScenarioRequest = z.input<typeof startScenarioRequestSchema>;

export const listScenariosQuerySchema = z.object({
  fitId: z.uuid("fitId must be a fit's id.").optional(),
});
