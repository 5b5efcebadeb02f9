"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import { buttonClass } from "@/ui/button-class";
import { formatMoney } from "@/ui/scenario/format";
import { dateText } from "./format";
import { SignoffBadge } from "./signoff-badge";

export type PickableScenario = {
  id: string;
  name: string;
  fitName: string;
  versions: {
    number: number;
    total: number;
    note: string;
    createdAt: string;
    warned: boolean;
    decision: { decision: "signed_off" | "declined"; decidedByName: string | null; decidedAt: string; reason: string } | null;
  }[];
};

type Pick = { scenarioId: string; version: number; label: string };

/** Choose 2–4 versions (of any scenarios of the workspace) and a baseline, then open them side by side. */
export function VersionPicker({ scenarios, money }: { scenarios: PickableScenario[]; money: MoneyLocale }) {
  const router = useRouter();
  const [picked, setPicked] = useState<Pick[]>([]);
  const [baseline, setBaseline] = useState(0);
  const key = (pick: { scenarioId: string; version: number }) => `${pick.scenarioId}:${pick.version}`;
  const isPicked = (scenarioId: string, version: number) => picked.some((pick) => pick.scenarioId === scenarioId && pick.version === version);

  const toggle = (scenario: PickableScenario, version: number, on: boolean) => {
    setPicked((current) => {
      const next = on ? [...current, { scenarioId: scenario.id, version, label: `${scenario.name} v${version}` }] : current.filter((pick) => !(pick.scenarioId === scenario.id && pick.version === version));
      if (baseline >= next.length) setBaseline(0);
      return next.slice(0, 4);
    });
  };

  const open = () => {
    const query = new URLSearchParams(picked.map((pick) => ["v", key(pick)]));
    query.set("baseline", String(baseline));
    router.push(`/compare/view?${query.toString()}`);
  };

  const withVersions = scenarios.filter((scenario) => scenario.versions.length > 0);
  if (withVersions.length === 0) return <p className="text-sm text-slate-700">No scenario has a saved version yet. Planners save versions on the scenario page.</p>;

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_18rem]" data-testid="version-picker">
      <ul className="space-y-4">
        {withVersions.map((scenario) => (
          <li key={scenario.id}>
            <p className="text-sm">
              <span className="font-semibold text-river">{scenario.name}</span> <span className="text-slate-600">on {scenario.fitName}</span>
            </p>
            <ul className="mt-1 flex flex-wrap gap-2">
              {scenario.versions.map((version) => {
                const checked = isPicked(scenario.id, version.number);
                const disabled = !checked && picked.length >= 4;
                return (
                  <li key={version.number}>
                    <label
                      className={`flex cursor-pointer items-center gap-2 rounded-md border px-2 py-1 text-sm ${checked ? "border-river bg-shallows-pale" : "border-slate-300 bg-white"} ${version.warned ? "border-l-4 border-l-ember" : ""} ${disabled ? "opacity-50" : ""}`}
                      title={`${version.note || "No note"} · saved ${dateText(version.createdAt, money.locale)}${version.warned ? " · carries extrapolation warnings" : ""}`}
                    >
                      <input type="checkbox" checked={checked} disabled={disabled} onChange={(event) => toggle(scenario, version.number, event.currentTarget.checked)} aria-label={`${scenario.name} version ${version.number}${version.warned ? ", has extrapolation warnings" : ""}`} />
                      <span className="num">
                        v{version.number} · {formatMoney(version.total, money)}
                      </span>
                      {version.warned ? <span className="text-xs text-[#9f3f2c]">has warnings</span> : null}
                      <SignoffBadge signoff={version.decision} locale={money.locale} />
                    </label>
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ul>
      <div className="space-y-3 rounded-md bg-silt/70 p-3">
        <p className="text-sm font-medium text-slate-800">{picked.length === 0 ? "Pick 2 to 4 versions." : `${picked.length} picked (2 to 4).`}</p>
        {picked.length > 0 ? (
          <fieldset className="space-y-1">
            <legend className="text-xs text-slate-600">Baseline: differences are measured from it</legend>
            {picked.map((pick, index) => (
              <label key={key(pick)} className="flex items-center gap-2 text-sm">
                <input type="radio" name="baseline" checked={baseline === index} onChange={() => setBaseline(index)} />
                {pick.label}
              </label>
            ))}
          </fieldset>
        ) : null}
        <button type="button" disabled={picked.length < 2} onClick={open} className={buttonClass("primary", "w-full")}>
          Show side by side
        </button>
      </div>
    </div>
  );
}
