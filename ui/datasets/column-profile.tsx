import type { DatasetColumnDto } from "@/server/datasets/store";
import { formatInUnit } from "@/ui/fits/format";
import { roleLabels } from "./format";

/** A column as the dataset page shows it (the stored column without its sample cells). */
export type ProfileColumn = Omit<DatasetColumnDto, "sample">;

/** Each column's role, unit, min / max / mean / standard deviation and missing count (tabular figures). */
export function ColumnProfile({ columns, locale, rowCount }: { columns: ProfileColumn[]; locale: string; rowCount: number }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[900px] text-sm" data-testid="column-profile">
        <thead>
          <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
            <th scope="col" className="py-2 pr-3">Column</th>
            <th scope="col" className="py-2 pr-3">Role</th>
            <th scope="col" className="py-2 pr-3">Unit</th>
            <th scope="col" className="py-2 pr-3 text-right">Min</th>
            <th scope="col" className="py-2 pr-3 text-right">Max</th>
            <th scope="col" className="py-2 pr-3 text-right">Mean</th>
            <th scope="col" className="py-2 pr-3 text-right">Std. dev.</th>
            <th scope="col" className="py-2 pr-3 text-right">Missing</th>
            <th scope="col" className="py-2 text-right">Not numbers</th>
          </tr>
        </thead>
        <tbody>
          {columns.map((c) => {
            const period = c.kind === "period";
            const money = !!c.unit && /^[A-Z]{3}$/.test(c.unit);
            // money as money; other numbers with up to 6 (min, max) or 4 (mean, std) significant digits, no padding zeros
            const value = (x: number | null, digits = 6) =>
              x === null || !Number.isFinite(x)
                ? "—"
                : money
                  ? formatInUnit(x, c.unit, locale, digits)
                  : new Intl.NumberFormat(locale, { maximumSignificantDigits: digits }).format(x) + (c.unit ? ` ${c.unit}` : "");
            return (
              <tr key={c.position} className="border-b border-slate-100" data-column={c.name}>
                <th scope="row" className="py-2 pr-3 text-left font-mono font-medium text-slate-900">
                  {c.name}
                </th>
                <td className="py-2 pr-3 text-slate-700">{c.role ? roleLabels[c.role] : <span className="text-slate-600">not chosen</span>}</td>
                <td className="py-2 pr-3 text-slate-700">{c.unit ?? (period ? "date" : <span className="text-slate-600">—</span>)}</td>
                {period ? (
                  <td colSpan={4} className="num py-2 pr-3 text-right text-slate-700">
                    {c.firstPeriod} to {c.lastPeriod}
                  </td>
                ) : (
                  <>
                    <td className="num py-2 pr-3 text-right">{value(c.min)}</td>
                    <td className="num py-2 pr-3 text-right">{value(c.max)}</td>
                    <td className="num py-2 pr-3 text-right">{value(c.mean, 4)}</td>
                    <td className="num py-2 pr-3 text-right">{value(c.std, 4)}</td>
                  </>
                )}
                <td className={`num py-2 pr-3 text-right ${c.missingCount > 0 ? "font-medium text-ember" : ""}`}>
                  {c.missingCount.toLocaleString(locale)}
                  {c.missingCount > 0 ? <span className="sr-only"> of {rowCount} rows missing</span> : null}
                </td>
                <td className="num py-2 text-right">{period ? "—" : c.textCount.toLocaleString(locale)}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
