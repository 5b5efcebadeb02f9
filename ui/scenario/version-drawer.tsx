"use client";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useEffect, useId, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import type { VersionSummaryDto } from "@/server/scenarios/types";
import type { FitRecord } from "@/server/stats";
import { formatDateTime, formatMoney, formatOutcome } from "./format";
import { VersionDiff } from "./version-diff";
import { textLinkClass } from "@/ui/button-class";

export interface VersionDrawerProps {
  open: boolean;
  onClose: () => void;
  scenarioId: string;
  versions: readonly VersionSummaryDto[];
  /** The version shown in the editor, if any. */
  opened: number | null;
  canWrite: boolean;
  busy: boolean;
  onOpenVersion: (number: number) => void;
  onRestore: (number: number) => void;
  record: FitRecord;
  shape: PlanShape;
  money: MoneyLocale;
}

/** Version history: every saved version, open or restore one, and compare two. */
export function VersionDrawer(props: VersionDrawerProps) {
  // The comparison's fetches are cached here: this drawer loads as a chunk of its own (with the query
  // library), only once it is opened.
  const [client] = useState(() => new QueryClient());
  return (
    <QueryClientProvider client={client}>
      <Drawer {...props} />
    </QueryClientProvider>
  );
}

function Drawer({ open, onClose, scenarioId, versions, opened, canWrite, busy, onOpenVersion, onRestore, record, shape, money }: VersionDrawerProps) {
  const titleId = useId();
  const latest = versions.at(-1)?.number ?? null;
  const [compare, setCompare] = useState<{ a: number; b: number } | null>(null);
  const [a, setA] = useState<number | null>(null);
  const [b, setB] = useState<number | null>(null);
  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === "Escape") onClose();
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [open, onClose]);
  if (!open) return null;
  const first = a ?? versions.at(-2)?.number ?? versions[0]?.number ?? null;
  const second = b ?? latest;
  return (
    <aside
      role="dialog"
      aria-modal="false"
      aria-labelledby={titleId}
      data-testid="version-drawer"
      className="fixed inset-y-0 right-0 z-20 flex w-full max-w-md flex-col overflow-y-auto border-l border-slate-200 bg-silt p-5 shadow-xl"
    >
      <div className="mb-4 flex items-center justify-between">
        <h2 id={titleId} className="text-lg font-semibold text-river">
          Version history
        </h2>
        <button type="button" onClick={onClose} className={`rounded px-2 py-1 text-sm ${textLinkClass}`}>
          Close
        </button>
      </div>
      {versions.length === 0 ? (
        <p className="text-sm text-slate-700">No version saved yet. Save version writes version 1.</p>
      ) : (
        <ol className="space-y-2" aria-label="Saved versions">
          {[...versions].reverse().map((version) => (
            <li key={version.number} data-version={version.number} className={`rounded-md bg-white p-3 shadow-sm ${opened === version.number ? "ring-2 ring-shallows" : ""}`}>
              <div className="flex items-baseline justify-between gap-2">
                <span className="font-semibold text-river">
                  v{version.number}
                  {version.number === latest ? <span className="ml-2 text-xs font-normal text-slate-600">latest</span> : null}
                </span>
                <span className="text-xs text-slate-600">
                  {version.authorName ?? "someone"} · {formatDateTime(version.createdAt, money.locale)}
                </span>
              </div>
              <p className="num text-sm text-slate-700">
                {formatMoney(version.total, money)} ({version.mode === "fixed" ? "Fixed total" : "Growing total"}) → {formatOutcome(version.horizonTotal.mean, shape, money)}
                {version.warningKinds.length > 0 ? <span className="ml-1 text-[#9f3f2c]">· warnings</span> : null}
              </p>
              {version.note ? <p className="mt-1 text-sm italic text-slate-600">“{version.note}”</p> : null}
              {version.restoredFrom ? <p className="text-xs text-slate-600">Restored from v{version.restoredFrom}</p> : null}
              <div className="mt-2 flex gap-3 text-sm">
                <button type="button" className={textLinkClass} onClick={() => onOpenVersion(version.number)}>
                  Open v{version.number}
                </button>
                {canWrite && version.number !== latest ? (
                  <button type="button" disabled={busy} className={`${textLinkClass} disabled:opacity-50`} onClick={() => onRestore(version.number)}>
                    Restore v{version.number} as v{(latest ?? 0) + 1}
                  </button>
                ) : null}
              </div>
            </li>
          ))}
        </ol>
      )}
      {versions.length >= 2 && first !== null && second !== null ? (
        <section aria-label="Compare two versions" className="mt-6 space-y-3 rounded-md bg-white p-3 shadow-sm">
          <h3 className="text-sm font-semibold text-river">Compare two versions</h3>
          <div className="flex items-center gap-2 text-sm">
            <label className="flex items-center gap-1">
              From
              <select value={first} onChange={(event) => setA(Number(event.currentTarget.value))} className="rounded border border-slate-300 px-1 py-0.5">
                {versions.map((version) => (
                  <option key={version.number} value={version.number}>
                    v{version.number}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex items-center gap-1">
              to
              <select value={second} onChange={(event) => setB(Number(event.currentTarget.value))} className="rounded border border-slate-300 px-1 py-0.5">
                {versions.map((version) => (
                  <option key={version.number} value={version.number}>
                    v{version.number}
                  </option>
                ))}
              </select>
            </label>
            <button type="button" className="rounded-md border border-shallows px-2 py-0.5 text-shallows hover:bg-shallows-pale" onClick={() => setCompare({ a: first, b: second })}>
              Compare
            </button>
          </div>
          {compare ? <VersionDiff scenarioId={scenarioId} a={compare.a} b={compare.b} record={record} shape={shape} money={money} /> : null}
        </section>
      ) : null}
    </aside>
  );
}
