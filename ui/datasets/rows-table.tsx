import Link from "next/link";

export type RowsPage = {
  total: number;
  offset: number;
  limit: number;
  columns: Array<{ position: number; name: string; kind: string; role: string | null }>;
  rows: Array<{ rowNumber: number; line: number; cells: Array<number | string | null> }>;
};

/** One server-side page of rows, with links to the neighbouring pages (`?page=` in the URL). */
export function RowsTable({ page, locale, hrefFor }: { page: RowsPage; locale: string; hrefFor: (page: number) => string }) {
  const current = Math.floor(page.offset / page.limit) + 1;
  const pages = Math.max(1, Math.ceil(page.total / page.limit));
  const first = page.total === 0 ? 0 : page.offset + 1;
  const last = Math.min(page.total, page.offset + page.limit);
  const number = new Intl.NumberFormat(locale, { maximumFractionDigits: 6 });
  const nav = (
    <nav aria-label="Pages of rows" className="flex flex-wrap items-center gap-2 text-sm">
      <span className="num text-slate-700" data-testid="rows-range">
        Rows {first.toLocaleString(locale)}–{last.toLocaleString(locale)} of {page.total.toLocaleString(locale)}
      </span>
      <span className="ml-auto flex items-center gap-1">
        {current > 1 ? (
          <>
            <Link href={hrefFor(1)} className="rounded px-2 py-1 text-shallows hover:bg-shallows-pale" aria-label="First page">
              « First
            </Link>
            <Link href={hrefFor(current - 1)} className="rounded px-2 py-1 text-shallows hover:bg-shallows-pale" rel="prev">
              ‹ Previous
            </Link>
          </>
        ) : null}
        <span className="num px-2 text-slate-700">
          Page {current.toLocaleString(locale)} of {pages.toLocaleString(locale)}
        </span>
        {current < pages ? (
          <>
            <Link href={hrefFor(current + 1)} className="rounded px-2 py-1 text-shallows hover:bg-shallows-pale" rel="next">
              Next ›
            </Link>
            <Link href={hrefFor(pages)} className="rounded px-2 py-1 text-shallows hover:bg-shallows-pale" aria-label="Last page">
              Last »
            </Link>
          </>
        ) : null}
      </span>
    </nav>
  );
  return (
    <div className="flex flex-col gap-3">
      {nav}
      <div className="overflow-x-auto rounded border border-slate-200">
        <table className="w-full text-sm" data-testid="rows-table">
          <thead className="bg-slate-50">
            <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
              <th scope="col" className="px-2 py-2 text-right">Row</th>
              {page.columns.map((c) => (
                <th key={c.position} scope="col" className={`whitespace-nowrap px-2 py-2 font-mono normal-case ${c.kind === "numeric" ? "text-right" : ""}`}>
                  {c.name}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {page.rows.map((row) => (
              <tr key={row.rowNumber} className="border-b border-slate-100 odd:bg-white even:bg-slate-50/50">
                <th scope="row" className="num px-2 py-1.5 text-right font-normal text-slate-600" title={`line ${row.line} of the file`}>
                  {row.rowNumber.toLocaleString(locale)}
                </th>
                {row.cells.map((cell, k) => (
                  <td key={k} className={`whitespace-nowrap px-2 py-1.5 ${typeof cell === "number" ? "num text-right" : ""}`}>
                    {cell === null ? (
                      <span className="text-ember" title="missing">
                        —<span className="sr-only"> missing</span>
                      </span>
                    ) : typeof cell === "number" ? (
                      number.format(cell)
                    ) : (
                      cell
                    )}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {pages > 1 ? nav : null}
    </div>
  );
}
