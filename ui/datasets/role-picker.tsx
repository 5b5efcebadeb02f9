"use client";

import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import type { DatasetColumnDto } from "@/server/datasets/store";
import { buttonClass } from "@/ui/button-class";
import { roleLabels, type ColumnRoleName } from "./format";
import { ProblemReport, type ApiProblem } from "./problem-report";

/** What the role picker needs of a stored column. */
export type PickerColumn = Pick<DatasetColumnDto, "position" | "name" | "kind" | "role" | "unit" | "numericCount" | "textCount" | "missingCount" | "sample">;

const OUTCOME_WORDS = /(^|[_\s-])(sales|revenue|turnover|orders|signups?|sign_ups|conversions|bookings|outcome|units_sold|leads)([_\s-]|$)/i;
const SPEND_WORDS = /(spend|cost|budget|media|^tv|radio|search|social|display|video|podcast|e-?mail|ooh|outdoor|print|affiliate|influencer|_eur$|_usd$|_gbp$|_chf$)/i;

/** A first guess at each column's role from its kind and name; the analyst confirms or changes it. */
export function guessRoles(columns: PickerColumn[]): Record<string, ColumnRoleName> {
  const roles: Record<string, ColumnRoleName> = {};
  let period = false;
  let outcome = false;
  for (const c of columns) {
    if (c.role) {
      roles[c.name] = c.role;
      continue;
    }
    if (c.kind === "period" && !period) {
      roles[c.name] = "period";
      period = true;
    } else if (c.kind !== "numeric") roles[c.name] = "ignored";
    else if (!outcome && OUTCOME_WORDS.test(c.name)) {
      roles[c.name] = "outcome";
      outcome = true;
    } else if (SPEND_WORDS.test(c.name)) roles[c.name] = "spend";
    else roles[c.name] = "control";
  }
  return roles;
}

/** A unit from the column name (sales_eur → EUR), else the workspace currency for money roles. */
function guessUnit(column: PickerColumn, role: ColumnRoleName, currency: string): string {
  if (column.unit) return column.unit;
  const suffix = /_(eur|usd|gbp|chf|sek|nok|dkk|pln|jpy|cad|aud)$/i.exec(column.name);
  if (suffix) return suffix[1].toUpperCase();
  return role === "spend" || role === "outcome" ? currency : "";
}

export function RolePicker(props: {
  datasetId: string;
  columns: PickerColumn[];
  currency: string;
  missingPolicy: "reject" | "drop-incomplete-rows";
  dateOrder: "YMD" | "DMY" | "MDY";
  rowCount: number;
}) {
  const router = useRouter();
  const [roles, setRoles] = useState<Record<string, ColumnRoleName>>(() => guessRoles(props.columns));
  const [units, setUnits] = useState<Record<string, string>>(() => {
    const guessed = guessRoles(props.columns);
    return Object.fromEntries(props.columns.map((c) => [c.name, guessUnit(c, guessed[c.name], props.currency)]));
  });
  const [missingPolicy, setMissingPolicy] = useState(props.missingPolicy);
  const [dateOrder, setDateOrder] = useState(props.dateOrder);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<ApiProblem | null>(null);

  const counts = useMemo(() => {
    const n = (role: ColumnRoleName) => Object.values(roles).filter((r) => r === role).length;
    return { outcome: n("outcome"), spend: n("spend"), control: n("control"), period: n("period") };
  }, [roles]);
  const checklist = [
    { ok: counts.outcome === 1, text: counts.outcome === 0 ? "Choose the outcome column (what the spend should explain)." : "Only one column can be the outcome." },
    { ok: counts.spend >= 1, text: "Choose at least one spend channel." },
    { ok: counts.period <= 1, text: "Only one column can be the period." },
  ];
  const blocking = checklist.filter((c) => !c.ok);
  const usedMissing = props.columns.filter((c) => roles[c.name] !== "ignored" && c.missingCount > 0);
  const hasTextPeriod = props.columns.some((c) => roles[c.name] === "period" && c.kind !== "numeric");

  function setRole(column: PickerColumn, role: ColumnRoleName) {
    setRoles((current) => {
      const next = { ...current, [column.name]: role };
      // one outcome and one period: choosing one elsewhere makes the old one a control / ignored
      if (role === "outcome" || role === "period") {
        for (const [name, r] of Object.entries(current)) if (name !== column.name && r === role) next[name] = role === "outcome" ? "control" : "ignored";
      }
      return next;
    });
    setUnits((current) => (current[column.name] ? current : { ...current, [column.name]: guessUnit(column, role, props.currency) }));
  }

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    if (blocking.length > 0) return;
    setBusy(true);
    setProblem(null);
    const body = {
      roles: Object.fromEntries(
        props.columns.map((c) => {
          const role = roles[c.name];
          const unit = units[c.name]?.trim();
          return [c.name, role !== "ignored" && role !== "period" && unit ? { role, unit } : { role }];
        }),
      ),
      missingPolicy,
      ...(hasTextPeriod ? { dateOrder } : {}),
    };
    try {
      const response = await fetch(`/api/datasets/${props.datasetId}/roles`, {
        method: "PUT",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify(body),
      });
      const result = await response.json().catch(() => ({ error: `The server answered ${response.status}.` }));
      if (!response.ok) {
        setProblem(result as ApiProblem);
        setBusy(false);
        return;
      }
      router.push(`/datasets/${props.datasetId}`);
      router.refresh();
    } catch {
      setProblem({ error: "The server could not be reached; try again." });
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="flex flex-col gap-6">
      <div className="overflow-x-auto">
        <table className="w-full min-w-[820px] text-sm" data-testid="role-table">
          <thead>
            <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
              <th scope="col" className="py-2 pr-3">Column</th>
              <th scope="col" className="py-2 pr-3">Detected</th>
              <th scope="col" className="py-2 pr-3">Sample values</th>
              <th scope="col" className="py-2 pr-3 text-right">Missing</th>
              <th scope="col" className="py-2 pr-3">Role</th>
              <th scope="col" className="py-2">Unit or currency</th>
            </tr>
          </thead>
          <tbody>
            {props.columns.map((c) => {
              const role = roles[c.name];
              const id = `role-${c.position}`;
              return (
                <tr key={c.position} className="border-b border-slate-100 align-middle">
                  <th scope="row" className="py-2 pr-3 text-left font-mono font-medium text-slate-900">
                    <label htmlFor={id}>{c.name}</label>
                  </th>
                  <td className="py-2 pr-3 text-slate-700">
                    {c.kind === "numeric" ? "numbers" : c.kind === "period" ? "dates" : c.numericCount > 0 ? "text and numbers" : "text"}
                  </td>
                  <td className="max-w-64 truncate py-2 pr-3 text-slate-600" title={c.sample.join(", ")}>
                    {c.sample.slice(0, 3).join(", ")}
                  </td>
                  <td className={`num py-2 pr-3 text-right ${c.missingCount > 0 ? "font-medium text-ember" : "text-slate-600"}`}>{c.missingCount.toLocaleString()}</td>
                  <td className="py-2 pr-3">
                    <select
                      id={id}
                      value={role}
                      onChange={(e) => setRole(c, e.target.value as ColumnRoleName)}
                      className="rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:outline-2 focus:outline-shallows"
                    >
                      {(Object.keys(roleLabels) as ColumnRoleName[]).map((r) => (
                        <option key={r} value={r}>
                          {roleLabels[r]}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="py-2">
                    {role === "ignored" || role === "period" ? (
                      <span className="text-slate-600">—</span>
                    ) : (
                      <input
                        aria-label={`Unit of ${c.name}`}
                        value={units[c.name] ?? ""}
                        onChange={(e) => setUnits({ ...units, [c.name]: e.target.value })}
                        maxLength={32}
                        placeholder={role === "control" ? "e.g. weeks, °C" : props.currency}
                        className="w-32 rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:outline-2 focus:outline-shallows"
                      />
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>

      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-medium text-slate-800">Missing values in the columns you use</legend>
        <p className="text-xs text-slate-600">
          {usedMissing.length === 0
            ? "None of the columns you use has an empty cell."
            : `${usedMissing.map((c) => `${c.name} (${c.missingCount})`).join(", ")} ${usedMissing.length === 1 ? "has" : "have"} empty cells.`}
        </p>
        <label className="flex items-start gap-2 text-sm">
          <input type="radio" name="missingPolicy" value="reject" checked={missingPolicy === "reject"} onChange={() => setMissingPolicy("reject")} className="mt-1" />
          <span>Reject: report every empty cell with its row and column, so I can fix the file.</span>
        </label>
        <label className="flex items-start gap-2 text-sm">
          <input
            type="radio"
            name="missingPolicy"
            value="drop-incomplete-rows"
            checked={missingPolicy === "drop-incomplete-rows"}
            onChange={() => setMissingPolicy("drop-incomplete-rows")}
            className="mt-1"
          />
          <span>Drop incomplete rows: leave rows with an empty cell out of fits (the rows stay stored; you will see how many).</span>
        </label>
      </fieldset>

      {hasTextPeriod ? (
        <div className="flex flex-col gap-1">
          <label htmlFor="date-order" className="text-sm font-medium text-slate-800">
            Dates such as 03/01/2024 mean
          </label>
          <select
            id="date-order"
            value={dateOrder}
            onChange={(e) => setDateOrder(e.target.value as typeof dateOrder)}
            className="w-72 rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm"
          >
            <option value="YMD">year-month-day (ISO dates only)</option>
            <option value="DMY">day/month/year (3 January 2024)</option>
            <option value="MDY">month/day/year (March 1, 2024)</option>
          </select>
        </div>
      ) : null}

      <ul className="flex flex-col gap-1 text-sm" aria-live="polite" data-testid="role-checklist">
        <li className="text-slate-700">
          {counts.outcome === 1 ? "1 outcome" : `${counts.outcome} outcomes`} · {counts.spend} spend {counts.spend === 1 ? "channel" : "channels"} · {counts.control}{" "}
          {counts.control === 1 ? "control" : "controls"} · {counts.period === 1 ? "a period column" : counts.period === 0 ? "no period column (file order)" : `${counts.period} period columns`} ·{" "}
          {props.rowCount.toLocaleString()} rows
        </li>
        {blocking.map((c) => (
          <li key={c.text} className="border-l-4 border-ember pl-2 text-slate-900">
            {c.text}
          </li>
        ))}
      </ul>

      {problem ? <ProblemReport problem={problem} title="These roles do not fit the data" /> : null}

      <div>
        <button type="submit" className={buttonClass("primary")} disabled={busy || blocking.length > 0}>
          {busy ? "Checking rows…" : "Check and save roles"}
        </button>
      </div>
    </form>
  );
}
