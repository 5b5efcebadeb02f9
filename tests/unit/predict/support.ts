// A fit record of the demo history (sales on six channels and the promotion-week control), built once.
import { demoChannels, demoControl, demoOutcome, generateDemoHistory } from "@/seed/history";
import { type FitRecord, type ModelSpecification, createFitRecord, fitModel } from "@/server/stats";

export const demoSpecification: ModelSpecification = {
  outcome: demoOutcome.column,
  intercept: true,
  terms: [...demoChannels.map((channel) => ({ kind: "linear" as const, column: channel.column })), { kind: "control" as const, column: demoControl.column }],
};

let cached: FitRecord | undefined;

export function demoRecord(): FitRecord {
  if (cached) return cached;
  const rows = generateDemoHistory();
  const columns: Record<string, number[]> = {};
  for (const column of [...demoChannels.map((channel) => channel.column), demoControl.column, demoOutcome.column]) {
    columns[column] = rows.map((row) => row[column as keyof typeof row] as number);
  }
  cached = createFitRecord(fitModel(demoSpecification, columns));
  return cached;
}

export const money = { currency: "EUR", locale: "en-IE" };

/** 13 weeks at the middle of every channel's observed range, `promo` promotion weeks. */
export function middlePlan(record: FitRecord, promo = 2) {
  const allocation: Record<string, number> = {};
  for (const channel of demoChannels) {
    const range = record.columnRanges[channel.column];
    allocation[channel.column] = Math.round(((range.minimum + range.maximum) / 2) * 13);
  }
  return { allocation, controls: { [demoControl.column]: promo }, horizon: 13 };
}
