import { z } from "zod";
import type { FitInput, FitTermInput } from "@/server/fits/types";

const columnName = z.string().trim().min(1, "Name a column").max(500);

/** A term: a column name (linear spend), or `{ column, transform, role }`. */
const termSchema = z.union([
  columnName,
  z
    .object({
      column: columnName,
      transform: z.enum(["none", "log1p"]).default("none"),
      role: z.enum(["spend", "control"]).default("spend"),
    })
    .strict(),
]);

const covarianceSchema = z.union([
  z.enum(["classical", "hc3", "newey-west"]).transform((type) => ({ type }) as FitInput["covariance"]),
  z.discriminatedUnion("type", [
    z.object({ type: z.literal("classical") }).strict(),
    z.object({ type: z.literal("hc3") }).strict(),
    z.object({ type: z.literal("newey-west"), lag: z.number().int().min(0).max(1000).optional() }).strict(),
  ]),
]);

/**
 * Body of POST /api/fits (and PUT /api/fits/{id}, a refit of a draft). `terms` are the spend
 * channels (or any term with its role), `controls` are held fixed by planners, `interactions` are
 * pairs of term columns.
 */
export const fitRequestSchema = z
  .object({
    datasetId: z.uuid("datasetId must be a dataset id"),
    name: z.string().trim().min(1).max(200).optional(),
    outcome: columnName,
    terms: z.array(termSchema).max(60, "At most 60 terms"),
    controls: z.array(columnName).max(30).default([]),
    interactions: z
      .array(z.union([z.tuple([columnName, columnName]), z.object({ columns: z.tuple([columnName, columnName]) }).strict()]))
      .max(30)
      .default([]),
    intercept: z.boolean().default(true),
    level: z.number().gt(0.5, "level is a confidence level such as 0.95").lt(1, "level must be below 1").default(0.95),
    covariance: covarianceSchema.default({ type: "classical" }),
  })
  .strict()
  .transform((body): FitInput => {
    const terms: FitTermInput[] = body.terms.map((term) =>
      typeof term === "string" ? { column: term, transform: "none", role: "spend" } : term,
    );
    for (const column of body.controls) terms.push({ column, transform: "none", role: "control" });
    return {
      datasetId: body.datasetId,
      name: body.name,
      outcome: body.outcome,
      terms,
      interactions: body.interactions.map((pair) => (Array.isArray(pair) ? [pair[0], pair[1]] : [pair.columns[0], pair.columns[1]])),
      intercept: body.intercept,
      level: body.level,
      covariance: body.covariance,
    };
  });

export type FitRequest = z.input<typeof fitRequestSchema>;

export const fitListQuerySchema = z
  .object({
    status: z
      .union([z.enum(["draft", "in_review", "changes_requested", "approved", "retired"]), z.array(z.enum(["draft", "in_review", "changes_requested", "approved", "retired"]))])
      .optional()
      .transform((value) => (value === undefined ? undefined : Array.isArray(value) ? value : [value])),
  })
  .strict();
