import { hexToRgb, readableTextOn } from "./contrast";
import { chartColors } from "./palette";

export type CorrelationGridProps = {
  /** Names of the rows and columns, in order. */
  labels: readonly string[];
  /** Square matrix of correlations in [−1, 1]. */
  values: readonly (readonly number[])[];
  caption?: string;
  /** Pairs at or above this |r| get an outline and a word, never colour alone. */
  strongAt?: number;
};

/**
 * Blend from white to a palette colour by |r| (shallows for positive, ember for negative), with white or
 * black text, whichever contrasts more: one of the two always reaches 4.5:1 (√21 ≈ 4.58 at worst).
 */
export function cellColor(value: number): { background: string; color: string } {
  if (!Number.isFinite(value)) return { background: "#f8fafc", color: chartColors.axis };
  const strength = Math.min(1, Math.abs(value));
  const [r, g, b] = hexToRgb(value >= 0 ? chartColors.shallows : chartColors.ember);
  const mix = (channel: number) => Math.round(255 + (channel - 255) * strength * 0.85);
  const background = [mix(r), mix(g), mix(b)] as const;
  return { background: `rgb(${background.join(", ")})`, color: readableTextOn(background, "#000000") };
}

/**
 * A correlation matrix as a colour-graded grid that prints every value (two decimals), with a
 * legend; strong pairs are outlined and marked "strong". Generic: datasets and fits both use it.
 */
export function CorrelationGrid({ labels, values, caption, strongAt = 0.8 }: CorrelationGridProps) {
  return (
    <div className="overflow-x-auto">
      <table className="border-separate border-spacing-0.5 text-xs">
        {caption ? <caption className="mb-2 text-left text-sm text-slate-700">{caption}</caption> : null}
        <thead>
          <tr>
            <th scope="col" className="p-1" />
            {labels.map((label) => (
              <th key={label} scope="col" className="max-w-24 p-1 text-left align-bottom font-medium text-slate-700">
                <span className="block [writing-mode:vertical-rl] rotate-180 whitespace-nowrap">{label}</span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {labels.map((rowLabel, row) => (
            <tr key={rowLabel}>
              <th scope="row" className="whitespace-nowrap p-1 pr-2 text-right font-medium text-slate-700">
                {rowLabel}
              </th>
              {labels.map((columnLabel, column) => {
                const value = values[row]?.[column] ?? NaN;
                const { background, color } = cellColor(value);
                const strong = row !== column && Math.abs(value) >= strongAt;
                return (
                  <td
                    key={columnLabel}
                    className={`num h-10 w-14 rounded text-center ${strong ? "outline-2 outline-ember" : ""}`}
                    style={{ background, color }}
                    title={`${rowLabel} and ${columnLabel}: r = ${Number.isFinite(value) ? value.toFixed(3) : "not defined"}${strong ? " (strong)" : ""}`}
                    data-strong={strong ? "true" : undefined}
                  >
                    {Number.isFinite(value) ? value.toFixed(2) : "—"}
                    {strong ? <span className="block text-[10px] leading-none">strong</span> : null}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-2 flex items-center gap-2 text-xs text-slate-600" aria-hidden="true">
        <span>−1</span>
        <span className="h-2.5 w-40 rounded" style={{ background: `linear-gradient(to right, ${cellColor(-1).background}, white, ${cellColor(1).background})` }} />
        <span>+1</span>
        <span className="ml-2">Pearson correlation; outlined cells: |r| ≥ {strongAt}</span>
      </div>
    </div>
  );
}
