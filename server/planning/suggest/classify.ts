/**
 * What shape the optimisation problem has, read from the fit's terms and coefficient signs. It
 * decides the method and whether the answer can be called the best plan or only a good one.
 *
 * Per channel (a raw spend column), from the estimable terms that read it:
 * - `affine`: only linear terms, or interactions with a control (β·price·spend is linear in spend);
 * - `log1p`: only log(1 + spend) terms;
 * - `other`: powers, a mix of the two, or an interaction with another channel.
 * Only channels that can move count: a term reading a locked channel and a free one is linear in
 * the free one. The predicted outcome is *separable* when no term reads two different movable
 * channels, and *concave*
 * when, in addition, every channel's part is concave: log1p with β ≥ 0, a power (or spend × spend)
 * with β ≤ 0 (spend is never negative, where x^k is convex), affine terms with any sign.
 */
import type { OutcomeModel } from "./outcome-model";

export type ChannelShape = "affine" | "log1p" | "other";

export interface ProblemShape {
  shapes: ChannelShape[];
  /** Every channel affine: F is linear in the amounts and the hull is a convex quadratic in them. */
  affine: boolean;
  separable: boolean;
  concave: boolean;
  /**
   * Every channel affine or log1p: in design coordinates (v = spend, or v = log(1 + spend)) the
   * outcome is linear and the hull convex, so the problem is convex there.
   */
  designConvex: boolean;
  /** Why the outcome is not concave in spend, in plain words (empty when it is). */
  nonConcaveReasons: string[];
}

/** Classifies the problem for the channels marked movable. Cost: O(p). */
export function classifyProblem(model: OutcomeModel, labelOf: (channel: string) => string, movable: readonly boolean[]): ProblemShape {
  const n = model.channelNames.length;
  const kinds: Set<string>[] = Array.from({ length: n }, () => new Set());
  const reasons: string[] = [];
  let separable = true;
  let concave = true;
  const offset = model.record.specification.intercept ? 1 : 0;
  model.termChannels.forEach((allChannels, column) => {
    const channels = allChannels.filter((j) => movable[j]);
    if (channels.length === 0 || model.estimablePosition[column] < 0) return;
    const term = model.record.specification.terms[column - offset];
    const beta = model.coefficients[column];
    if (term.kind === "interaction" && channels.length === 2) {
      separable = false;
      concave = false;
      for (const j of channels) kinds[j].add("other");
      reasons.push(`${labelOf(model.channelNames[channels[0]])} × ${labelOf(model.channelNames[channels[1]])} interaction`);
      return;
    }
    const j = channels[0];
    const selfProduct = term.kind === "interaction" && term.columns[0] === term.columns[1];
    if (term.kind === "power" || selfProduct) {
      kinds[j].add("other");
      if (beta > 0) {
        concave = false;
        reasons.push(`${labelOf(model.channelNames[j])} has a rising curvature term (${model.record.termNames[column]})`);
      }
    } else if (term.kind === "log1p") {
      kinds[j].add("log1p");
      if (beta < 0) {
        concave = false;
        reasons.push(`log(1 + ${labelOf(model.channelNames[j])}) has a negative coefficient`);
      }
    } else kinds[j].add("affine");
  });
  const shapes = kinds.map((set): ChannelShape => {
    if (set.has("other") || (set.has("log1p") && set.has("affine"))) return "other";
    return set.has("log1p") ? "log1p" : "affine";
  });
  return {
    shapes,
    affine: shapes.every((shape) => shape === "affine"),
    separable,
    concave,
    designConvex: shapes.every((shape) => shape !== "other"),
    nonConcaveReasons: reasons,
  };
}
