"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import { type PlanShape, periodsWord } from "@/server/predict/plan-shape";
import { scenarioApi } from "./api";
import { formatMoney } from "./format";

export interface StartScenarioFormProps {
  fitId: string;
  shape: PlanShape;
  money: MoneyLocale;
  defaultHorizon: number;
  maxHorizon: number;
  /** The spend of the most recent `defaultHorizon` periods. */
  defaultStart: { allocation: Record<string, number>; controls: Record<string, number>; description: string };
  versionsToStartFrom: { scenarioId: string; name: string; latestVersion: number }[];
}

/** Name, horizon, controls and the starting allocation of a new scenario. */
export function StartScenarioForm({ fitId, shape, money, defaultHorizon, maxHorizon, defaultStart, versionsToStartFrom }: StartScenarioFormProps) {
  const router = useRouter();
  const id = useId();
  const [name, setName] = useState("");
  const [horizon, setHorizon] = useState(defaultHorizon);
  const [controls, setControls] = useState<Record<string, number>>(defaultStart.controls);
  const [startFrom, setStartFrom] = useState<string>("history");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const total = Object.values(defaultStart.allocation).reduce((sum, amount) => sum + amount, 0);

  const submit = async (event: React.FormEvent) => {
    event.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      const from = versionsToStartFrom.find((option) => `${option.scenarioId}:${option.latestVersion}` === startFrom);
      const created = await scenarioApi.start({
        fitId,
        name,
        ...(from ? { startFrom: { scenarioId: from.scenarioId, version: from.latestVersion } } : { horizon, controls }),
      });
      router.push(`/scenarios/${created.id}`);
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
      setBusy(false);
    }
  };

  return (
    <form onSubmit={submit} className="max-w-2xl space-y-5 rounded-lg border border-slate-200 bg-white p-5 shadow-sm" aria-describedby={problem ? `${id}-problem` : undefined}>
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-name`} className="text-sm font-medium text-slate-800">
          Name
        </label>
        <input
          id={`${id}-name`}
          required
          maxLength={200}
          value={name}
          onChange={(event) => setName(event.currentTarget.value)}
          placeholder="e.g. Spring push, more podcast"
          className="rounded-md border border-slate-300 px-3 py-2"
        />
      </div>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-slate-800">Starting allocation</legend>
        <label className="flex items-start gap-2 text-sm">
          <input type="radio" name="start" value="history" checked={startFrom === "history"} onChange={() => setStartFrom("history")} className="mt-1" />
          <span>
            What was spent in the most recent {periodsWord(horizon, shape.periodNoun)} of the history
            {horizon === defaultHorizon ? (
              <span className="num block text-slate-600">
                {defaultStart.description}: {formatMoney(total, money)} (
                {shape.channels.map((channel) => `${channel.label} ${formatMoney(defaultStart.allocation[channel.name] ?? 0, money)}`).join(", ")})
              </span>
            ) : (
              <span className="block text-slate-600">Summed per channel when the scenario is created.</span>
            )}
          </span>
        </label>
        {versionsToStartFrom.map((option) => (
          <label key={option.scenarioId} className="flex items-start gap-2 text-sm">
            <input
              type="radio"
              name="start"
              value={`${option.scenarioId}:${option.latestVersion}`}
              checked={startFrom === `${option.scenarioId}:${option.latestVersion}`}
              onChange={(event) => setStartFrom(event.currentTarget.value)}
              className="mt-1"
            />
            <span>
              The last saved version of “{option.name}” (v{option.latestVersion}), with its horizon and controls
            </span>
          </label>
        ))}
      </fieldset>
      {startFrom === "history" ? (
        <div className="flex flex-wrap gap-6">
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-horizon`} className="text-sm font-medium text-slate-800">
              Horizon ({shape.periodNoun}s)
            </label>
            <input
              id={`${id}-horizon`}
              type="number"
              min={1}
              max={maxHorizon}
              value={horizon}
              onChange={(event) => setHorizon(Math.max(1, Math.min(maxHorizon, Math.round(Number(event.currentTarget.value) || 1))))}
              className="num w-28 rounded-md border border-slate-300 px-3 py-2 text-right"
            />
            <span className="text-xs text-slate-600">Default: a quarter ({periodsWord(defaultHorizon, shape.periodNoun)}).</span>
          </div>
          {shape.controls.map((control) => (
            <div key={control.name} className="flex flex-col gap-1">
              <label htmlFor={`${id}-${control.name}`} className="text-sm font-medium text-slate-800">
                {control.label} {control.kind === "count" ? `(${shape.periodNoun}s of ${horizon})` : `(per ${shape.periodNoun})`}
              </label>
              <input
                id={`${id}-${control.name}`}
                type="number"
                min={control.kind === "count" ? 0 : undefined}
                max={control.kind === "count" ? horizon : undefined}
                step={control.kind === "count" ? 1 : "any"}
                value={controls[control.name] ?? 0}
                onChange={(event) => setControls({ ...controls, [control.name]: Number(event.currentTarget.value) })}
                className="num w-28 rounded-md border border-slate-300 px-3 py-2 text-right"
              />
            </div>
          ))}
        </div>
      ) : null}
      <p className="text-sm text-slate-600">
        Amounts are entered for the whole horizon in {money.currency}; the model reads them per {shape.periodNoun} (amount ÷ {horizon}).
      </p>
      {problem ? (
        <p id={`${id}-problem`} role="alert" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm">
          {problem}
        </p>
      ) : null}
      <button type="submit" disabled={busy} className="rounded-md bg-shallows px-4 py-2 text-sm font-medium text-white hover:bg-river disabled:opacity-60">
        {busy ? "Starting…" : "Start the scenario"}
      </button>
    </form>
  );
}
