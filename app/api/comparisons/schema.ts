import { z } from "zod";

export const versionRefSchema = z.object({
  scenarioId: z.uuid("scenarioId must be a scenario's id."),
  version: z.number({ error: "version is the version number (1, 2, …)." }).int().min(1),
});

export const createComparisonRequestSchema = z.object({
  name: z.string().trim().min(1, "Give the comparison a name.").max(200, "Use at most 200 characters."),
  /** 2–4 scenario versions of the workspace, in column order. */
  versions: z.array(versionRefSchema).min(2, "Pick at least 2 versions.").max(4, "Pick at most 4 versions."),
  /** Position (0-based) in `versions` of the baseline the differences are measured from. Default 0. */
  baseline: z.number().int().min(0).max(3).default(0),
});
export type CreateComparisonRequest = z.input<typeof createComparisonRequestSchema>;
