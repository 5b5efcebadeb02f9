"use client";

import { useRouter } from "next/navigation";
import { useId, useState, useTransition } from "react";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { problemText, reviewApi } from "./api";

/**
 * Finance's decision on exactly this version: sign it off (an optional remark), or decline it with a
 * reason (required). A later version of the scenario needs its own decision.
 */
export function SignoffForm({
  scenarioId,
  version,
  scenarioName,
  warned,
  decided = null,
}: {
  scenarioId: string;
  version: number;
  scenarioName: string;
  warned: boolean;
  /** The version's current decision, if any: the form then opens on request to record another. */
  decided?: "signed_off" | "declined" | null;
}) {
  const router = useRouter();
  const id = useId();
  const [mode, setMode] = useState<"idle" | "decline">("idle");
  const [open, setOpen] = useState(decided === null);
  const [remark, setRemark] = useState("");
  const [reason, setReason] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();

  const decide = (decision: "signed_off" | "declined") => {
    setProblem(null);
    if (decision === "declined" && reason.trim() === "") {
      setProblem(`Say why you decline version ${version}.`);
      return;
    }
    startTransition(async () => {
      try {
        await reviewApi.decide(scenarioId, version, decision === "declined" ? { decision, reason } : { decision, reason: remark });
        setDone(decision === "signed_off" ? `You signed off version ${version}.` : `You declined version ${version}.`);
        setMode("idle");
        setOpen(false);
        setReason("");
        setRemark("");
        router.refresh();
      } catch (error) {
        setProblem(problemText(error));
      }
    });
  };

  if (!open) {
    return (
      <div className="print:hidden" aria-live="polite">
        {done ? (
          <p role="status" className="mb-2 rounded-md border-l-4 border-reed bg-reed/10 px-3 py-2 text-sm">
            {done}
          </p>
        ) : null}
        <button type="button" onClick={() => setOpen(true)} className={`text-sm font-medium ${textLinkClass}`}>
          Record another decision on version {version}
        </button>
      </div>
    );
  }

  return (
    <div className="space-y-3 rounded-md border border-slate-200 bg-silt/60 p-3 print:hidden" data-testid="signoff-form">
      <p className="text-sm font-medium text-slate-800">
        Your decision on “{scenarioName}” version {version}
      </p>
      {warned ? (
        <p className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm">
          This version carries extrapolation warnings: the model has no data there; treat its number as a guess.
        </p>
      ) : null}
      {mode === "idle" ? (
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex min-w-56 flex-1 flex-col gap-1 text-sm">
            <span className="text-slate-700">Remark (optional)</span>
            <input
              value={remark}
              onChange={(event) => setRemark(event.currentTarget.value)}
              maxLength={4000}
              className="rounded border border-slate-300 px-2 py-1.5 outline-none focus-visible:ring-2 focus-visible:ring-shallows"
            />
          </label>
          <button type="button" disabled={pending} onClick={() => decide("signed_off")} className="inline-flex items-center justify-center rounded-md bg-reed px-4 py-2 text-sm font-medium text-white hover:bg-[#46602a] focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-reed disabled:cursor-not-allowed disabled:opacity-60">
            {pending ? "Saving…" : `Sign off version ${version}`}
          </button>
          <button type="button" disabled={pending} onClick={() => setMode("decline")} className={buttonClass("danger")}>
            Decline…
          </button>
        </div>
      ) : (
        <form
          className="space-y-2"
          onSubmit={(event) => {
            event.preventDefault();
            decide("declined");
          }}
        >
          <label htmlFor={`${id}-reason`} className="block text-sm font-medium text-slate-700">
            Why do you decline version {version}? (required)
          </label>
          <textarea
            id={`${id}-reason`}
            value={reason}
            onChange={(event) => setReason(event.currentTarget.value)}
            rows={3}
            maxLength={4000}
            required
            autoFocus
            className="w-full rounded border border-slate-300 px-2 py-1.5 text-sm outline-none focus-visible:ring-2 focus-visible:ring-shallows"
          />
          <div className="flex gap-3">
            <button type="submit" disabled={pending} className={buttonClass("danger")}>
              {pending ? "Saving…" : `Decline version ${version}`}
            </button>
            <button type="button" onClick={() => setMode("idle")} className={buttonClass("quiet", "px-0")}>
              Cancel
            </button>
          </div>
        </form>
      )}
      <div aria-live="polite">
        {problem ? (
          <p role="alert" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm">
            {problem}
          </p>
        ) : done ? (
          <p role="status" className="rounded-md border-l-4 border-reed bg-reed/10 px-3 py-2 text-sm">
            {done}
          </p>
        ) : null}
      </div>
    </div>
  );
}
