/** One detail of an API error: `row`/`column` (name) for cells, `line`, `columnNumber`, `kind`, `value`. */
export type ProblemDetail = {
  path?: string;
  message: string;
  row?: number;
  column?: string;
  columnNumber?: number;
  line?: number;
  kind?: string;
  value?: string;
};

export type ApiProblem = { error: string; details?: ProblemDetail[] };

/**
 * The one clear report of a refused upload or role assignment: the summary sentence, then each problem
 * with its row, line and column, in a table (the first 200 are listed; the summary counts them all).
 */
export function ProblemReport({ problem, title = "Problems in the file" }: { problem: ApiProblem; title?: string }) {
  const details = problem.details ?? [];
  const listed = details.filter((d) => d.kind !== "omitted");
  const omitted = details.find((d) => d.kind === "omitted");
  const located = listed.some((d) => d.row !== undefined || d.column !== undefined || d.columnNumber !== undefined || d.line !== undefined);
  return (
    <div role="alert" data-testid="problem-report" className="rounded-lg border border-ember bg-white shadow-sm">
      <div className="border-l-4 border-ember bg-ember/10 px-4 py-3">
        <p className="font-semibold text-slate-900">{title}</p>
        <p className="mt-0.5 text-sm text-slate-800">{problem.error}</p>
      </div>
      {listed.length > 0 ? (
        <div className="max-h-96 overflow-auto px-4 py-3">
          {located ? (
            <table className="w-full text-sm" data-testid="problem-table">
              <thead>
                <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
                  <th scope="col" className="py-1.5 pr-3 text-right">Row</th>
                  <th scope="col" className="py-1.5 pr-3 text-right">Line</th>
                  <th scope="col" className="py-1.5 pr-3">Column</th>
                  <th scope="col" className="py-1.5">Problem</th>
                </tr>
              </thead>
              <tbody>
                {listed.map((d, i) => (
                  <tr key={i} className="border-b border-slate-100 align-top" data-kind={d.kind}>
                    <td className="num py-1.5 pr-3 text-right">{d.row ?? "—"}</td>
                    <td className="num py-1.5 pr-3 text-right text-slate-600">{d.line ?? "—"}</td>
                    <td className="py-1.5 pr-3">
                      {d.column ? <span className="font-mono">{d.column}</span> : null}
                      {d.columnNumber !== undefined ? <span className="text-slate-600">{d.column ? ` (${d.columnNumber})` : `column ${d.columnNumber}`}</span> : null}
                      {!d.column && d.columnNumber === undefined ? "—" : null}
                    </td>
                    <td className="py-1.5 text-slate-800">{d.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <ul className="list-disc space-y-1 pl-5 text-sm text-slate-800">
              {listed.map((d, i) => (
                <li key={i} data-kind={d.kind}>
                  {d.message}
                </li>
              ))}
            </ul>
          )}
          {omitted ? <p className="mt-2 text-sm text-slate-600">{omitted.message}</p> : null}
        </div>
      ) : null}
    </div>
  );
}
