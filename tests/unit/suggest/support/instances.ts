// Random but reproducible planning instances: a weekly spend history generated from chosen true
// coefficients (negative ones included), fitted by the engine into a fit record, and a current
// plan with bounds, locks and a mode. Shared by the suggestion and response-curve tests.
import { type AllocationChannel, type AllocationState, createAllocationState } from "@/server/planning/allocation";
import type { PeriodGroup } from "@/server/planning/suggest";
import { type FitRecord, type ModelSpecification, type TermSpecification, createFitRecord, fitModel } from "@/server/stats";
import { createRandom } from "../../stats/support/random";

export type InstanceKind = "linear" | "log1p" | "interaction" | "mixed-control";

export interface InstanceOptions {
  kind: InstanceKind;
  channelCount: number;
  seed: number;
  /** Include a price control (level) and a promotion control (0/1). */
  controls?: boolean;
  /** Allow negative true coefficients (default true for linear). */
  negative?: boolean;
  /** log1p instances: false draws log1p coefficients of either sign (default: positive). */
  concave?: boolean;
  /** Linear instances with controls: add a spend × promotion interaction (still linear in spend). */
  controlInteraction?: boolean;
  /** Spend channels move together (a narrow hull, so it binds). */
  correlated?: boolean;
  /** Standard deviation of the outcome noise (default 2000). */
  noise?: number;
}

export interface Instance {
  record: FitRecord;
  specification: ModelSpecification;
  channels: string[];
  /** Training spend per week: column → values. */
  data: Record<string, Float64Array>;
}

const rowCount = 104;

/** Fits a record on two years of generated weekly data. */
export function makeInstance(options: InstanceOptions): Instance {
  const random = createRandom(options.seed);
  const channels = Array.from({ length: options.channelCount }, (_, j) => `ch${j}`);
  const data: Record<string, Float64Array> = {};
  const terms: TermSpecification[] = [];
  let signal = Float64Array.from({ length: rowCount }, () => 50_000);
  const allowNegative = options.negative ?? true;
  const common = Float64Array.from({ length: rowCount }, () => random.uniform() - 0.5);
  channels.forEach((name, j) => {
    const base = 1_000 + 20_000 * random.uniform();
    const spread = base * (0.3 + 1.2 * random.uniform());
    data[name] = Float64Array.from({ length: rowCount }, (_, row) =>
      Math.max(0, base + spread * (options.correlated ? 0.85 * common[row] + 0.15 * (random.uniform() - 0.5) : random.uniform() - 0.5)),
    );
    const logTerm = options.kind === "log1p" || (options.kind !== "linear" && j % 2 === 1);
    if (logTerm) {
      const beta = options.concave === false ? 4000 * (random.uniform() - 0.3) : 500 + 4000 * random.uniform();
      terms.push({ kind: "log1p", column: name });
      signal = signal.map((value, row) => value + beta * Math.log1p(data[name][row]));
    } else {
      const beta = allowNegative ? 3 * random.uniform() - 0.8 : 0.2 + 3 * random.uniform();
      terms.push({ kind: "linear", column: name });
      signal = signal.map((value, row) => value + beta * data[name][row]);
    }
  });
  if (options.kind === "interaction" && channels.length >= 2) {
    terms.push({ kind: "interaction", columns: [channels[0], channels[1]] });
    const beta = (random.uniform() - 0.5) * 4e-4;
    signal = signal.map((value, row) => value + beta * data[channels[0]][row] * data[channels[1]][row]);
  }
  if (options.controls || options.kind === "mixed-control") {
    data.price = Float64Array.from({ length: rowCount }, () => 9 + 2 * random.uniform());
    data.promo = Float64Array.from({ length: rowCount }, () => (random.uniform() < 0.25 ? 1 : 0));
    terms.push({ kind: "control", column: "price" }, { kind: "control", column: "promo" });
    signal = signal.map((value, row) => value - 3000 * data.price[row] + 8000 * data.promo[row]);
    if (options.kind === "mixed-control" || options.controlInteraction) {
      // Spend × a control is still linear in spend: the problem stays exact.
      terms.push({ kind: "interaction", columns: [channels[0], "promo"] });
      signal = signal.map((value, row) => value + 0.5 * data[channels[0]][row] * data.promo[row]);
    }
  }
  data.sales = signal.map((value) => value + (options.noise ?? 2_000) * random.normal());
  const specification: ModelSpecification = { outcome: "sales", intercept: true, terms };
  const record = createFitRecord(fitModel(specification, data));
  return { record, specification, channels, data };
}

export interface PlanOptions {
  seed: number;
  mode: "fixed" | "growing";
  horizonPeriods?: number;
  locks?: boolean;
  bounds?: boolean;
  /** Keep the current plan inside the observed ranges (so it is a feasible plan). */
  insideObserved?: boolean;
}

/** A current plan on the instance's channels, inside the observed range × H when asked. */
export function makePlan(instance: Instance, options: PlanOptions): AllocationState {
  const random = createRandom(options.seed);
  const H = options.horizonPeriods ?? 13;
  const channels: AllocationChannel[] = instance.channels.map((name) => {
    const range = instance.record.columnRanges[name];
    const low = Math.ceil(range.minimum * H * 100) + 1;
    const high = Math.floor(range.maximum * H * 100) - 1;
    const inside = low + Math.floor(random.uniform() * (high - low));
    const amountCents = options.insideObserved === false ? Math.floor(inside * (0.5 + random.uniform())) : inside;
    const channel: AllocationChannel = { name, label: name.toUpperCase(), amountCents, locked: options.locks === true && random.uniform() < 0.2 };
    if (options.bounds && random.uniform() < 0.4) channel.floorCents = Math.floor(amountCents * (0.3 + 0.6 * random.uniform()));
    if (options.bounds && random.uniform() < 0.4) channel.ceilingCents = Math.ceil(amountCents * (1 + 0.5 * random.uniform()));
    return channel;
  });
  return createAllocationState({ channels, horizonPeriods: H, mode: options.mode, growth: 0.05 + 0.3 * random.uniform() });
}

/** Control groups for an instance with controls: promotion on in the first `promoWeeks` weeks. */
export function controlGroups(horizonPeriods: number, promoWeeks: number, price = 10): PeriodGroup[] {
  const groups: PeriodGroup[] = [];
  if (promoWeeks > 0) groups.push({ point: { price, promo: 1 }, periods: promoWeeks });
  if (promoWeeks < horizonPeriods) groups.push({ point: { price, promo: 0 }, periods: horizonPeriods - promoWeeks });
  return groups;
}
