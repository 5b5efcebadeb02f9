"use client";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { defaultNeweyWestLag } from "@/server/stats/covariance-choice";
import { ApiErrorBox, type ApiErrorBody } from "@/ui/api-error-box";
import { buttonClass } from "@/ui/button-class";

export type BuilderColumn = { name: string; role: string | null; unit: string | null };
export type BuilderDataset = { id: string; name: string; status: string; rowCount: number; usableRows: number; columns: BuilderColumn[] };
export type BuilderTerm = { column: string; transform: "none" | "log1p"; role: "spend" | "control" };
export type BuilderInitial = {
  datasetId: string;
  name?: string;
  outcome: string;
  terms: BuilderTerm[];
  interactions: [string, string][];
  intercept: boolean;
  level: number;
  covariance: { type: "classical" | "hc3" | "newey-west"; lag?: number };
};

type ApiError = ApiErrorBody;
type JobView = { id: string; status: string; progress: { phase: string; done: number; total: number | null; message?: string } | null };

/** Default request for a dataset: its outcome, every spend channel (linear) and every control. */
function defaultsFor(dataset: BuilderDataset): BuilderInitial {
  const outcome = dataset.columns.find((c) => c.role === "outcome")?.name ?? "";
  return {
    datasetId: dataset.id,
    outcome,
    terms: dataset.columns
      .filter((c) => c.role === "spend" || c.role === "control")
      .map((c) => ({ column: c.name, transform: "none", role: c.role === "control" ? "control" : "spend" })),
    interactions: [],
    intercept: true,
    level: 0.95,
    covariance: { type: "classical" },
  };
}

const levels = [0.8, 0.9, 0.95, 0.99];

/**
 * The fit builder: dataset, outcome, terms with transforms, interactions, intercept, covariance and
 * level; shows the design (n, number of terms) as it changes and refuses what the engine would.
 * Small datasets come back fitted at once; large ones run as a job whose progress shows here.
 */
export function FitBuilder(props: {
  datasets: BuilderDataset[];
  initial: BuilderInitial | null;
  refitId: string | null;
  /** Durbin–Watson of the fit this one starts from, when it suggests autocorrelation. */
  autocorrelatedDurbinWatson?: number | null;
}) {
  const router = useRouter();
  const ready = props.datasets.filter((d) => d.status === "ready");
  const start = props.initial ?? (ready[0] ? defaultsFor(ready[0]) : null);
  const [datasetId, setDatasetId] = useState(start?.datasetId ?? "");
  const [outcome, setOutcome] = useState(start?.outcome ?? "");
  const [included, setIncluded] = useState<Record<string, BuilderTerm>>(() => Object.fromEntries((start?.terms ?? []).map((t) => [t.column, t])));
  const [interactions, setInteractions] = useState<[string, string][]>(start?.interactions ?? []);
  const [pair, setPair] = useState<[string, string]>(["", ""]);
  const [intercept, setIntercept] = useState(start?.intercept ?? true);
  const [level, setLevel] = useState(start?.level ?? 0.95);
  const [covarianceType, setCovarianceType] = useState(start?.covariance.type ?? "classical");
  const [lag, setLag] = useState<string>(start?.covariance.lag !== undefined ? String(start.covariance.lag) : "");
  const [name, setName] = useState(start?.name ?? "");
  const [mode, setMode] = useState<"new" | "refit">(props.refitId ? "refit" : "new");
  const [error, setError] = useState<ApiError | null>(null);
  const [busy, setBusy] = useState(false);
  const [job, setJob] = useState<JobView | null>(null);

  const dataset = props.datasets.find((d) => d.id === datasetId) ?? null;
  const numericColumns = dataset?.columns.filter((c) => c.role === "outcome" || c.role === "spend" || c.role === "control") ?? [];
  const candidates = numericColumns.filter((c) => c.name !== outcome);
  const terms = candidates.filter((c) => included[c.name]).map((c) => included[c.name]);
  const termColumns = terms.map((t) => t.column);
  const liveInteractions = interactions.filter(([a, b]) => termColumns.includes(a) && termColumns.includes(b));
  const n = dataset?.usableRows ?? 0;
  const p = terms.length + liveInteractions.length + (intercept ? 1 : 0);
  const autoLag = n > 0 ? defaultNeweyWestLag(n) : 0;

  const problems = useMemo(() => {
    const list: string[] = [];
    if (!dataset) list.push("Choose a spend history.");
    else if (!outcome) list.push("Choose the outcome.");
    if (dataset && p === 0) list.push("Choose at least one term, or keep the intercept.");
    if (dataset && p > 0 && n <= p) list.push(`The fit needs more rows than terms: ${n} rows and ${p} terms. Remove terms or use a longer history.`);
    if (covarianceType === "newey-west" && lag !== "" && !(Number.isInteger(Number(lag)) && Number(lag) >= 0 && Number(lag) < n)) {
      list.push(`The Newey–West lag must be a whole number from 0 to ${Math.max(0, n - 1)}.`);
    }
    return list;
  }, [dataset, outcome, p, n, covarianceType, lag]);

  function chooseDataset(id: string) {
    setDatasetId(id);
    const next = props.datasets.find((d) => d.id === id);
    if (!next) return;
    const defaults = defaultsFor(next);
    setOutcome(defaults.outcome);
    setIncluded(Object.fromEntries(defaults.terms.map((t) => [t.column, t])));
    setInteractions([]);
    setError(null);
  }

  function toggle(column: BuilderColumn, on: boolean) {
    setIncluded((current) => {
      const next = { ...current };
      if (on) next[column.name] = { column: column.name, transform: "none", role: column.role === "control" ? "control" : "spend" };
      else delete next[column.name];
      return next;
    });
  }

  function addInteraction() {
    const [a, b] = pair;
    if (!a || !b || a === b) return;
    if (liveInteractions.some(([x, y]) => (x === a && y === b) || (x === b && y === a))) return;
    setInteractions([...liveInteractions, [a, b]]);
    setPair(["", ""]);
  }

  /** Polls the fit job until it ends; resolves with the page to open (the job's `links.page`). */
  async function poll(jobId: string): Promise<string> {
    for (;;) {
      await new Promise((resolve) => setTimeout(resolve, 800));
      const response = await fetch(`/api/jobs/${jobId}`, { cache: "no-store" });
      const body = await response.json();
      if (!response.ok) throw body as ApiError;
      setJob({ id: body.id, status: body.status, progress: body.progress });
      if (body.status === "succeeded") return (body.links?.page as string | undefined) ?? `/fits/${body.result.fitId as string}`;
      if (body.status === "failed") throw { error: body.error?.message ?? "The fit failed.", details: body.error?.details ?? [] } as ApiError;
    }
  }

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    if (problems.length > 0 || !dataset) return;
    setBusy(true);
    setError(null);
    setJob(null);
    const body = {
      datasetId: dataset.id,
      ...(name.trim() ? { name: name.trim() } : {}),
      outcome,
      terms,
      interactions: liveInteractions,
      intercept,
      level,
      covariance: covarianceType === "newey-west" ? { type: "newey-west", ...(lag !== "" ? { lag: Number(lag) } : {}) } : { type: covarianceType },
    };
    try {
      const refit = mode === "refit" && props.refitId;
      const response = await fetch(refit ? `/api/fits/${props.refitId}` : "/api/fits", {
        method: refit ? "PUT" : "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify(body),
      });
      const result = await response.json().catch(() => ({ error: `The server answered ${response.status}.` }));
      if (response.status === 202) {
        setJob({ id: result.job.id, status: result.job.status, progress: null });
        router.push(await poll(result.job.id)); // the job's links.page: the stored fit's page
        return;
      }
      if (!response.ok) {
        setError(result as ApiError);
        setBusy(false);
        return;
      }
      router.push(`/fits/${result.id}`);
    } catch (caught) {
      setError(typeof caught === "object" && caught && "error" in caught ? (caught as ApiError) : { error: "The server could not be reached; try again." });
      setBusy(false);
    }
  }

  if (props.datasets.length === 0) {
    return <p className="text-sm text-slate-700">There is no spend history in this workspace yet. Upload one first.</p>;
  }

  const fieldset = "rounded-lg border border-slate-200 bg-white p-5 shadow-sm";
  const legend = "px-1 text-base font-semibold text-river";
  return (
    <form onSubmit={submit} className="grid gap-6 lg:grid-cols-[1fr_18rem]" aria-describedby="design-preview">
      <div className="flex flex-col gap-6">
        <fieldset className={fieldset}>
          <legend className={legend}>Data</legend>
          <div className="grid gap-4 sm:grid-cols-2">
            <label className="flex flex-col gap-1 text-sm font-medium text-slate-800">
              Spend history
              <select value={datasetId} onChange={(e) => chooseDataset(e.target.value)} className="rounded-md border border-slate-300 bg-white px-3 py-2 font-normal" name="datasetId">
                {props.datasets.map((d) => (
                  <option key={d.id} value={d.id} disabled={d.status !== "ready"}>
                    {d.name} ({d.usableRows.toLocaleString()} rows){d.status !== "ready" ? " — roles not assigned" : ""}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-1 text-sm font-medium text-slate-800">
              Outcome
              <select value={outcome} onChange={(e) => setOutcome(e.target.value)} className="rounded-md border border-slate-300 bg-white px-3 py-2 font-normal" name="outcome">
                {numericColumns.map((c) => (
                  <option key={c.name} value={c.name}>
                    {c.name} ({c.unit ?? "no unit"}){c.role === "outcome" ? "" : ` — a ${c.role} column`}
                  </option>
                ))}
              </select>
            </label>
          </div>
        </fieldset>

        <fieldset className={fieldset}>
          <legend className={legend}>Terms</legend>
          <p className="mb-3 text-sm text-slate-600">
            Spend channels can enter as they are or as log(1 + x), a diminishing-returns shape. Controls (promotions, price, season) enter as they are; planners hold them fixed.
          </p>
          <table className="w-full text-sm">
            <thead>
              <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
                <th scope="col" className="py-2 pr-3">Use</th>
                <th scope="col" className="py-2 pr-3">Column</th>
                <th scope="col" className="py-2 pr-3">Role</th>
                <th scope="col" className="py-2">Shape</th>
              </tr>
            </thead>
            <tbody>
              {candidates.map((column) => {
                const term = included[column.name];
                const id = `term-${column.name}`;
                return (
                  <tr key={column.name} className="border-b border-slate-100">
                    <td className="py-2 pr-3">
                      <input id={id} type="checkbox" checked={!!term} onChange={(e) => toggle(column, e.target.checked)} className="h-4 w-4 accent-shallows" />
                    </td>
                    <td className="py-2 pr-3">
                      <label htmlFor={id} className="font-mono">
                        {column.name}
                      </label>{" "}
                      <span className="text-xs text-slate-600">({column.unit ?? "no unit"})</span>
                    </td>
                    <td className="py-2 pr-3 text-slate-700">{column.role === "control" ? "Control" : column.role === "spend" ? "Spend" : "Outcome column"}</td>
                    <td className="py-2">
                      {term && term.role === "spend" ? (
                        <select
                          aria-label={`Shape of ${column.name}`}
                          value={term.transform}
                          onChange={(e) => setIncluded({ ...included, [column.name]: { ...term, transform: e.target.value as "none" | "log1p" } })}
                          className="rounded-md border border-slate-300 bg-white px-2 py-1"
                        >
                          <option value="none">Linear (as it is)</option>
                          <option value="log1p">log(1 + x): diminishing returns</option>
                        </select>
                      ) : term ? (
                        <span className="text-slate-600">Linear</span>
                      ) : (
                        <span className="text-slate-600">—</span>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <label className="mt-4 flex items-center gap-2 text-sm text-slate-800">
            <input type="checkbox" checked={intercept} onChange={(e) => setIntercept(e.target.checked)} className="h-4 w-4 accent-shallows" />
            Intercept (baseline {outcome || "outcome"} with no spend). Leave it on unless zero spend surely means zero {outcome || "outcome"}.
          </label>
        </fieldset>

        <fieldset className={fieldset}>
          <legend className={legend}>Interactions (optional)</legend>
          <p className="mb-3 text-sm text-slate-600">A pairwise interaction lets one channel&apos;s effect depend on another&apos;s spend (synergy). Each adds a term.</p>
          <div className="flex flex-wrap items-end gap-2">
            {[0, 1].map((slot) => (
              <label key={slot} className="flex flex-col gap-1 text-sm font-medium text-slate-800">
                {slot === 0 ? "First term" : "Second term"}
                <select
                  value={pair[slot]}
                  onChange={(e) => setPair(slot === 0 ? [e.target.value, pair[1]] : [pair[0], e.target.value])}
                  className="rounded-md border border-slate-300 bg-white px-2 py-1.5 font-normal"
                >
                  <option value="">Choose…</option>
                  {termColumns.map((column) => (
                    <option key={column} value={column}>
                      {column}
                    </option>
                  ))}
                </select>
              </label>
            ))}
            <button type="button" onClick={addInteraction} disabled={!pair[0] || !pair[1] || pair[0] === pair[1]} className={buttonClass("secondary")}>
              Add interaction
            </button>
          </div>
          {liveInteractions.length > 0 ? (
            <ul className="mt-3 flex flex-wrap gap-2">
              {liveInteractions.map(([a, b]) => (
                <li key={`${a}:${b}`} className="inline-flex items-center gap-2 rounded-full bg-shallows-pale px-3 py-1 text-sm">
                  <span className="font-mono">
                    {a}:{b}
                  </span>
                  <button type="button" aria-label={`Remove interaction ${a} and ${b}`} onClick={() => setInteractions(liveInteractions.filter(([x, y]) => !(x === a && y === b)))} className="text-ember">
                    ×
                  </button>
                </li>
              ))}
            </ul>
          ) : null}
        </fieldset>

        <fieldset className={fieldset}>
          <legend className={legend}>Standard errors and intervals</legend>
          {props.autocorrelatedDurbinWatson != null && covarianceType !== "newey-west" ? (
            <p className="mb-3 rounded-md border-l-4 border-ember bg-silt px-3 py-2 text-sm text-slate-900" data-testid="newey-west-suggestion">
              The fit this one starts from has a Durbin–Watson statistic of {props.autocorrelatedDurbinWatson.toFixed(2)}, far from 2: its errors look
              autocorrelated. Newey–West standard errors allow for that.{" "}
              <button type="button" onClick={() => setCovarianceType("newey-west")} className="font-medium text-shallows underline underline-offset-2">
                Use Newey–West
              </button>
            </p>
          ) : null}
          <div className="flex flex-col gap-2 text-sm text-slate-800">
            {(
              [
                ["classical", "Classical", "Errors independent with equal variance."],
                ["hc3", "HC3", "Robust to unequal error variance (heteroskedasticity). Use it when the Breusch–Pagan check finds the spread changing."],
                ["newey-west", "Newey–West", "Robust to unequal variance and to errors that carry over from week to week (autocorrelation). Use it when Durbin–Watson is far from 2."],
              ] as const
            ).map(([value, label, hint]) => (
              <label key={value} className="flex items-start gap-2">
                <input type="radio" name="covariance" value={value} checked={covarianceType === value} onChange={() => setCovarianceType(value)} className="mt-1 accent-shallows" />
                <span>
                  <span className="font-medium">{label}</span> <span className="text-slate-600">— {hint}</span>
                </span>
              </label>
            ))}
            {covarianceType === "newey-west" ? (
              <label className="ml-6 flex items-center gap-2">
                Lag (weeks)
                <input
                  type="number"
                  min={0}
                  step={1}
                  value={lag}
                  placeholder={`auto: ${autoLag}`}
                  onChange={(e) => setLag(e.target.value)}
                  className="num w-28 rounded-md border border-slate-300 px-2 py-1"
                />
                <span className="text-xs text-slate-600">Empty: ⌊4(n/100)^(2/9)⌋ = {autoLag}</span>
              </label>
            ) : null}
            <label className="mt-2 flex items-center gap-2">
              Confidence level
              <select value={level} onChange={(e) => setLevel(Number(e.target.value))} className="rounded-md border border-slate-300 bg-white px-2 py-1">
                {levels.map((value) => (
                  <option key={value} value={value}>
                    {Math.round(value * 100)}%
                  </option>
                ))}
              </select>
            </label>
          </div>
        </fieldset>
      </div>

      <aside className="flex flex-col gap-4 lg:sticky lg:top-4 lg:self-start">
        <div id="design-preview" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm" aria-live="polite" data-testid="design-preview">
          <h2 className="text-base font-semibold text-river">Design</h2>
          <dl className="mt-2 grid grid-cols-2 gap-y-1 text-sm">
            <dt className="text-slate-600">Rows (n)</dt>
            <dd className="num text-right font-semibold" data-testid="design-n">
              {n.toLocaleString()}
            </dd>
            <dt className="text-slate-600">Terms (p)</dt>
            <dd className="num text-right font-semibold" data-testid="design-p">
              {p}
            </dd>
            <dt className="text-slate-600">Residual df</dt>
            <dd className="num text-right">{Math.max(0, n - p)}</dd>
          </dl>
          <p className="mt-2 text-xs text-slate-600">
            {intercept ? "Intercept, " : ""}
            {terms.filter((t) => t.role === "spend").length} spend, {terms.filter((t) => t.role === "control").length} control
            {liveInteractions.length ? `, ${liveInteractions.length} interaction${liveInteractions.length > 1 ? "s" : ""}` : ""}.
            {n > 50_000 ? " A large history: the fit runs in the background and this page shows its progress." : ""}
          </p>
          {problems.length > 0 ? (
            <ul className="mt-3 space-y-1 text-sm text-ember" data-testid="design-problems">
              {problems.map((problem) => (
                <li key={problem}>{problem}</li>
              ))}
            </ul>
          ) : null}
        </div>
        <div className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
          <label className="flex flex-col gap-1 text-sm font-medium text-slate-800">
            Name (optional)
            <input value={name} onChange={(e) => setName(e.target.value)} maxLength={200} placeholder={`${outcome || "outcome"} on ${terms.length} terms`} className="rounded-md border border-slate-300 px-3 py-2 font-normal" />
          </label>
          {props.refitId ? (
            <fieldset className="mt-3 text-sm">
              <legend className="font-medium text-slate-800">Save as</legend>
              <label className="mt-1 flex items-center gap-2">
                <input type="radio" checked={mode === "refit"} onChange={() => setMode("refit")} className="accent-shallows" /> Update this draft
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" checked={mode === "new"} onChange={() => setMode("new")} className="accent-shallows" /> A new draft
              </label>
            </fieldset>
          ) : null}
          <button type="submit" disabled={busy || problems.length > 0} className={buttonClass("primary", "mt-4 w-full")}>
            {busy ? (job ? "Fitting in the background…" : "Fitting…") : "Fit"}
          </button>
          {job ? (
            <div className="mt-3" data-testid="fit-job-progress">
              <p className="text-sm text-slate-700">
                {job.status === "queued" ? "Waiting for a worker…" : (job.progress?.phase ?? "Starting…")}
                {job.status !== "queued" && job.progress?.message ? <span className="text-slate-600"> · {job.progress.message}</span> : null}
              </p>
              <div
                role="progressbar"
                aria-label="Fit progress"
                aria-valuemin={0}
                aria-valuemax={job.progress?.total ?? 1}
                aria-valuenow={job.status === "queued" ? undefined : (job.progress?.done ?? 0)}
                className="mt-1 h-2 w-full overflow-hidden rounded-full bg-shallows-pale"
              >
                <div
                  className={`h-full rounded-full bg-shallows transition-[width] duration-500 ${job.status === "queued" ? "animate-pulse" : ""}`}
                  style={{ width: `${job.status === "queued" ? 8 : Math.max(8, (100 * ((job.progress?.done ?? 0) + 0.5)) / ((job.progress?.total ?? 1) + 0.5))}%` }}
                />
              </div>
            </div>
          ) : null}
        </div>
        {error ? <ApiErrorBox error={error} className="rounded-lg p-4 shadow-sm" testId="fit-error" /> : null}
      </aside>
    </form>
  );
}
