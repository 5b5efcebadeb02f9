"use client";

import dynamic from "next/dynamic";
import { useRouter } from "next/navigation";
import { memo, useCallback, useEffect, useMemo, useRef, useState } from "react";
import { type AllocationState, allocationPerHorizon, amountToCents, centsToAmount, formatCents, type MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import { channelWarningSentences } from "@/server/predict/channel-warnings";
import type { ScenarioOutcome, ScenarioPlan } from "@/server/predict/scenario-outcome";
import type { ChannelSettings, ScenarioDto, VersionDto } from "@/server/scenarios/types";
import type { FitRecord } from "@/server/stats";
import type { HeldOutSummary } from "@/server/fits/types";
import { AllocationPanel } from "@/ui/allocation";
import { createAllocationStore, useAllocationStore, type AllocationStore } from "@/ui/stores/allocation-store";
import { ApiError, scenarioApi } from "./api";
import { shiftShare } from "./cautions";
import { ControlsPanel } from "./controls-panel";
import { formatDateTime } from "./format";
import { OutcomePanel } from "./outcome-panel";
import { allocationFromPlan, planOf } from "./room-plan";
import { useScenarioPrediction } from "./use-scenario-prediction";
import { textLinkClass } from "@/ui/button-class";

export { allocationFromPlan } from "./room-plan";

/** The version list is read again when the tab comes back after at least this long (others may have saved). */
const VERSIONS_FRESH_MS = 5_000;

// Loaded after the first paint (their chunks are not part of the page's first load): the suggestion
// panel, the response curves below the fold (with the chart library) and the version drawer (only once
// it is opened). Placeholders keep the layout where they will appear.
const SuggestPanel = dynamic(() => import("@/ui/suggest/suggest-panel").then((module) => module.SuggestPanel), {
  ssr: false,
  loading: () => <div className="min-h-28 rounded-lg border border-slate-200 bg-white shadow-sm" aria-busy="true" />,
});
const ResponseCurvesSection = dynamic(() => import("@/ui/response-curves/response-curves-section").then((module) => module.ResponseCurvesSection), {
  ssr: false,
  loading: () => <div className="min-h-64 rounded-lg border border-slate-200 bg-white shadow-sm" aria-busy="true" />,
});
const VersionDrawer = dynamic(() => import("./version-drawer").then((module) => module.VersionDrawer), { ssr: false });
const preloadVersionDrawer = () => void import("./version-drawer");

export interface ScenarioRoomProps {
  scenario: ScenarioDto;
  fit: { id: string; name: string; status: string; record: FitRecord; shape: PlanShape };
  /** The latest saved version (opened on arrival), or null before the first save. */
  initialVersion: VersionDto | null;
  /** The server's outcome of the plan the room opens with (the preview engine loads after the first paint). */
  initialOutcome: ScenarioOutcome | null;
  money: MoneyLocale;
  /** May change the plan and save versions (scenario:write on an approved fit); otherwise the room is read-only. */
  canWrite: boolean;
  canPredict: boolean;
  /** How the fit's intervals did on the latest periods held out of a refit; null when unknown. */
  heldOut?: HeldOutSummary | null;
}

function settingsOf(allocation: AllocationState): ChannelSettings {
  const settings: ChannelSettings = {};
  for (const channel of allocation.channels) {
    if (channel.locked || channel.floorCents !== undefined || channel.ceilingCents !== undefined) {
      settings[channel.name] = {
        ...(channel.locked ? { locked: true } : {}),
        ...(channel.floorCents !== undefined ? { floorCents: channel.floorCents } : {}),
        ...(channel.ceilingCents !== undefined ? { ceilingCents: channel.ceilingCents } : {}),
      };
    }
  }
  return settings;
}

/** The save request of the plan on screen. */
export function saveBody(allocation: AllocationState, controls: Record<string, number>, baseVersion: number, note: string) {
  return {
    baseVersion,
    note,
    mode: allocation.mode,
    allocation: allocationPerHorizon(allocation),
    total: centsToAmount(allocation.totalCents),
    ceiling: allocation.mode === "growing" ? centsToAmount(allocation.ceilingCents) : null,
    horizon: allocation.horizonPeriods,
    controls,
    settings: settingsOf(allocation),
  };
}

// The panel's rows subscribe to their own slices of the store; re-render the panel itself only when
// its props (the warning sentences) change, not on every move of the outcome above it.
const MemoAllocationPanel = memo(AllocationPanel);
const MemoControlsPanel = memo(ControlsPanel);

type Conflict = { message: string; latestVersion: number | null };

/** The scenario screen: channel rows on the left, the outcome on the right, history in a drawer. */
export function ScenarioRoom({ scenario, fit, initialVersion, initialOutcome, money, canWrite, canPredict, heldOut = null }: ScenarioRoomProps) {
  const shape = fit.shape;
  const startTotalCents = amountToCents(scenario.baseline.total);
  const baselinePlan: ScenarioPlan = useMemo(
    () => ({ allocation: scenario.baseline.allocation, controls: scenario.baseline.controls, horizon: scenario.baseline.horizon }),
    [scenario.baseline],
  );
  const [store] = useState<AllocationStore>(() =>
    createAllocationStore(allocationFromPlan(shape, initialVersion ?? scenario.baseline, startTotalCents), { money }),
  );
  const [controls, setControls] = useState<Record<string, number>>(() => ({ ...(initialVersion ?? scenario.baseline).controls }));
  const [baseVersion, setBaseVersion] = useState(scenario.latestVersion ?? 0);
  // After a save, the page's server parts (finance status in the header, the review) are read again;
  // the room's own state lives in this component and its store, which a refresh keeps.
  const router = useRouter();
  const [opened, setOpened] = useState<number | null>(initialVersion?.number ?? null);
  const [note, setNote] = useState("");
  const [busy, setBusy] = useState(false);
  const [drawerOpen, setDrawerOpen] = useState(false);
  const [drawerUsed, setDrawerUsed] = useState(false);
  const [message, setMessage] = useState<{ tone: "ok" | "problem"; text: string } | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);

  const [versionList, setVersionList] = useState(scenario.versions);
  const versionsReadAt = useRef(0);
  /** Versions already fetched (a saved version never changes). */
  const fetchedVersions = useRef(new Map<number, VersionDto>());

  const allocation = useAllocationStore(store, (state) => state.allocation);
  const plan = useMemo(() => planOf(allocation, controls), [allocation, controls]);
  const prediction = useScenarioPrediction({ fitId: fit.id, record: fit.record, shape, money, plan, baseline: baselinePlan, initialOutcome, canPredict });
  const warningKey = JSON.stringify(channelWarningSentences(shape, prediction.outcome?.warnings ?? []));
  const rangeWarnings = useMemo(() => JSON.parse(warningKey) as Record<string, string | null>, [warningKey]);
  const shift = useMemo(() => shiftShare(plan.allocation, baselinePlan.allocation), [plan, baselinePlan]);

  const loadVersion = useCallback(
    (version: VersionDto) => {
      store.getState().load(allocationFromPlan(shape, version, startTotalCents));
      setControls({ ...version.controls });
      setOpened(version.number);
    },
    [store, shape, startTotalCents],
  );

  const refreshVersions = useCallback(async () => {
    const list = await scenarioApi.versions(scenario.id);
    versionsReadAt.current = Date.now();
    setVersionList(list);
    return list;
  }, [scenario.id]);

  useEffect(() => {
    versionsReadAt.current = Date.now();
    const onVisible = () => {
      if (document.visibilityState === "visible" && Date.now() - versionsReadAt.current >= VERSIONS_FRESH_MS) refreshVersions().catch(() => {});
    };
    window.addEventListener("focus", onVisible);
    document.addEventListener("visibilitychange", onVisible);
    return () => {
      window.removeEventListener("focus", onVisible);
      document.removeEventListener("visibilitychange", onVisible);
    };
  }, [refreshVersions]);

  const handleError = useCallback((error: unknown) => {
    if (error instanceof ApiError && error.status === 409 && error.details.some((detail) => "latestVersion" in detail)) {
      const detail = error.details.find((item) => "latestVersion" in item) as { latestVersion: number; savedBy?: string; savedAt?: string };
      const when = detail.savedAt ? formatDateTime(detail.savedAt, money.locale) : null;
      setConflict({
        latestVersion: detail.latestVersion,
        message: when
          ? `Version ${detail.latestVersion} was saved by ${detail.savedBy ?? "someone"} at ${when} after the version you started from. Reload to see it; your changes are kept in this page.`
          : error.message,
      });
      setMessage(null);
    } else {
      setMessage({ tone: "problem", text: error instanceof Error ? error.message : String(error) });
    }
  }, [money.locale]);

  const save = async () => {
    setBusy(true);
    setMessage(null);
    try {
      const saved = await scenarioApi.save(scenario.id, saveBody(store.getState().allocation, controls, baseVersion, note));
      setBaseVersion(saved.number);
      setOpened(saved.number);
      setNote("");
      setConflict(null);
      fetchedVersions.current.set(saved.number, saved);
      await refreshVersions();
      router.refresh();
      setMessage({ tone: "ok", text: `Saved as version ${saved.number}.${saved.warnings.length > 0 ? " It carries extrapolation warnings." : ""}` });
    } catch (error) {
      handleError(error);
    } finally {
      setBusy(false);
    }
  };

  const restore = async (number: number) => {
    setBusy(true);
    setMessage(null);
    try {
      const saved = await scenarioApi.save(scenario.id, { baseVersion, restoreFrom: number });
      setBaseVersion(saved.number);
      loadVersion(saved);
      await refreshVersions();
      router.refresh();
      setMessage({ tone: "ok", text: `Version ${number} restored as version ${saved.number}.` });
    } catch (error) {
      handleError(error);
    } finally {
      setBusy(false);
    }
  };

  const openVersion = async (number: number) => {
    try {
      const version = fetchedVersions.current.get(number) ?? (await scenarioApi.version(scenario.id, number));
      fetchedVersions.current.set(number, version);
      loadVersion(version);
      setMessage({
        tone: "ok",
        text: canWrite ? `Opened version ${number}. Saving makes a new version after version ${baseVersion}.` : `Opened version ${number} (read-only).`,
      });
    } catch (error) {
      handleError(error);
    }
  };

  /** After a conflict: learn the latest version and keep the edits on screen, now based on it. */
  const reloadKeepingEdits = async () => {
    const list = await refreshVersions();
    const latest = list.at(-1)?.number ?? 0;
    setBaseVersion(latest);
    setConflict(null);
    setMessage({ tone: "ok", text: `Now based on version ${latest}; your changes are still here. Open version ${latest} from the history to see it.` });
  };

  const latest = versionList.at(-1)?.number ?? null;
  const setControl = useCallback((name: string, value: number) => setControls((current) => ({ ...current, [name]: value })), []);
  const perPeriodTotal = formatCents(Math.round(allocation.totalCents / allocation.horizonPeriods), money);

  return (
    <div className="space-y-4">
      {prediction.serverRequest}
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-slate-700" data-testid="version-status">
          {opened ? (
            <>
              Showing <strong>version {opened}</strong>
              {latest !== null && opened !== latest ? ` (latest is version ${latest})` : ""}
            </>
          ) : (
            <>Starting plan: {scenario.baseline.description}. Not saved yet.</>
          )}
        </p>
        <button
          type="button"
          onClick={() => {
            setDrawerUsed(true);
            setDrawerOpen(true);
          }}
          onPointerEnter={preloadVersionDrawer}
          onFocus={preloadVersionDrawer}
          className="rounded-md border border-shallows bg-white px-3 py-1.5 text-sm font-medium text-shallows hover:bg-shallows-pale"
        >
          Version history ({versionList.length})
        </button>
      </div>

      {conflict ? (
        <div role="alert" data-testid="save-conflict" className="space-y-2 rounded-md border-l-4 border-ember bg-white px-4 py-3 text-sm text-slate-900 shadow-sm">
          <p>{conflict.message}</p>
          <div className="flex gap-3">
            <button type="button" onClick={reloadKeepingEdits} className="rounded-md bg-shallows px-3 py-1.5 font-medium text-white hover:bg-river">
              Reload versions, keep my changes
            </button>
            {conflict.latestVersion ? (
              <button type="button" onClick={() => openVersion(conflict.latestVersion as number).then(() => reloadKeepingEdits())} className={textLinkClass}>
                Open version {conflict.latestVersion} instead (drops my changes)
              </button>
            ) : null}
          </div>
        </div>
      ) : null}

      {canWrite && canPredict ? <SuggestPanel fitId={fit.id} store={store} controls={controls} shape={shape} money={money} canWrite={canWrite} /> : null}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,28rem)]">
        <div className="space-y-4">
          <p className="num text-sm text-slate-600" data-testid="unit-conversion">
            Amounts are per horizon in {money.currency}: {formatCents(allocation.totalCents, money)} over {allocation.horizonPeriods} {shape.periodNoun}s = {perPeriodTotal} per{" "}
            {shape.periodNoun}, the unit the model was fitted on (each channel&apos;s amount ÷ {allocation.horizonPeriods}, spread evenly).
          </p>
          <MemoAllocationPanel store={store} money={money} periodNoun={shape.periodNoun} rangeWarnings={rangeWarnings} globalShortcuts readOnly={!canWrite} />
          <MemoControlsPanel shape={shape} horizon={allocation.horizonPeriods} controls={controls} onChange={setControl} disabled={!canWrite} />
          {canWrite ? (
            <div className="flex flex-wrap items-end gap-3 rounded-md bg-white px-4 py-3 shadow-sm">
              <label className="flex min-w-56 flex-1 flex-col gap-1 text-sm">
                <span className="font-medium text-slate-700">Note for this version</span>
                <input
                  value={note}
                  onChange={(event) => setNote(event.currentTarget.value)}
                  maxLength={2000}
                  placeholder="What changed and why"
                  className="rounded border border-slate-300 px-2 py-1.5 outline-none focus-visible:ring-2 focus-visible:ring-shallows"
                />
              </label>
              <button
                type="button"
                onClick={save}
                disabled={busy}
                className="rounded-md bg-shallows px-4 py-2 text-sm font-medium text-white hover:bg-river disabled:opacity-60"
              >
                {busy ? "Saving…" : `Save version ${baseVersion + 1}`}
              </button>
            </div>
          ) : null}
          <div aria-live="polite" data-testid="save-message">
            {message ? (
              <p className={`rounded-md border-l-4 px-3 py-2 text-sm ${message.tone === "ok" ? "border-reed bg-reed/10" : "border-ember bg-ember/10"}`} role={message.tone === "ok" ? "status" : "alert"}>
                {message.text}
              </p>
            ) : null}
          </div>
        </div>
        <div className="lg:sticky lg:top-4 lg:self-start">
          <OutcomePanel
            outcome={prediction.outcome}
            source={prediction.source}
            fetching={prediction.fetching}
            error={prediction.error ?? prediction.previewError}
            shape={shape}
            money={money}
            baselineTotal={prediction.outcome?.difference?.baselineTotal ?? null}
            baselineDescription={scenario.baseline.description}
            shift={shift}
            heldOut={heldOut}
          />
        </div>
      </div>

      <ResponseCurvesSection record={fit.record} shape={shape} store={store} controls={controls} money={money} />

      {drawerUsed ? (
        <VersionDrawer
        open={drawerOpen}
        onClose={() => setDrawerOpen(false)}
        scenarioId={scenario.id}
        versions={versionList}
        opened={opened}
        canWrite={canWrite}
        busy={busy}
        onOpenVersion={openVersion}
        onRestore={restore}
        record={fit.record}
        shape={shape}
        money={money}
        />
      ) : null}
    </div>
  );
}
