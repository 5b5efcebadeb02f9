"use client";

import { useId, useState, useTransition } from "react";
import { buttonClass } from "@/ui/button-class";
import { problemText, reviewApi } from "./api";

export type FinanceMember = { userId: string; name: string | null; email: string };

type Target = { kind: "comparison"; comparisonId: string } | { kind: "version"; scenarioId: string; version: number };

/**
 * A planner shares a comparison or one version with chosen finance members: each gets an e-mail with
 * the link and a notification. When a shared version carries warnings, an acknowledgement is required.
 */
export function ShareForm({ target, financeMembers, warnedVersions, title }: { target: Target; financeMembers: FinanceMember[]; warnedVersions: string[]; title: string }) {
  const id = useId();
  const [chosen, setChosen] = useState<string[]>([]);
  const [note, setNote] = useState("");
  const [acknowledgement, setAcknowledgement] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  const warned = warnedVersions.length > 0;

  if (financeMembers.length === 0) {
    return <p className="text-sm text-slate-600">Nobody in this workspace has the finance role yet; an admin can give it.</p>;
  }

  const toggle = (userId: string, on: boolean) => setChosen((current) => (on ? [...new Set([...current, userId])] : current.filter((value) => value !== userId)));

  const submit = () => {
    setProblem(null);
    setDone(null);
    if (chosen.length === 0) return setProblem("Choose at least one finance member.");
    if (warned && acknowledgement.trim() === "") return setProblem("Write an acknowledgement of the warnings to share.");
    startTransition(async () => {
      try {
        const body = { recipients: chosen, note, acknowledgement: warned ? acknowledgement : null };
        const result = target.kind === "comparison" ? await reviewApi.shareComparison(target.comparisonId, body) : await reviewApi.shareVersion(target.scenarioId, target.version, body);
        const names = financeMembers.filter((member) => chosen.includes(member.userId)).map((member) => member.name ?? member.email);
        setDone(`Shared with ${names.join(", ")}. ${result.mailedTo.length === names.length ? "Each got an e-mail with the link." : "Some e-mails could not be sent; they still see it under Notifications."}`);
        setChosen([]);
        setNote("");
        setAcknowledgement("");
      } catch (error) {
        setProblem(problemText(error));
      }
    });
  };

  return (
    <form
      className="space-y-3 print:hidden"
      data-testid="share-form"
      onSubmit={(event) => {
        event.preventDefault();
        submit();
      }}
    >
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium text-slate-700">Share {title} with</legend>
        <div className="flex flex-wrap gap-x-5 gap-y-1">
          {financeMembers.map((member) => (
            <label key={member.userId} className="flex items-center gap-2 text-sm">
              <input type="checkbox" checked={chosen.includes(member.userId)} onChange={(event) => toggle(member.userId, event.currentTarget.checked)} />
              <span>
                {member.name ?? member.email} <span className="text-slate-600">({member.email})</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <label className="flex flex-col gap-1 text-sm">
        <span className="text-slate-700">Note (optional)</span>
        <input
          value={note}
          onChange={(event) => setNote(event.currentTarget.value)}
          maxLength={2000}
          placeholder="What you would like finance to look at"
          className="rounded border border-slate-300 px-2 py-1.5 outline-none focus-visible:ring-2 focus-visible:ring-shallows"
        />
      </label>
      {warned ? (
        <div className="space-y-1 rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2">
          <label htmlFor={`${id}-ack`} className="block text-sm font-medium text-slate-900">
            {warnedVersions.join(", ")} {warnedVersions.length === 1 ? "carries" : "carry"} extrapolation warnings: the model has no data there. Acknowledge them
            to share (required).
          </label>
          <textarea
            id={`${id}-ack`}
            value={acknowledgement}
            onChange={(event) => setAcknowledgement(event.currentTarget.value)}
            rows={2}
            maxLength={2000}
            placeholder="e.g. Podcast above its range is a deliberate test; treat its number as a guess."
            className="w-full rounded border border-slate-300 bg-white px-2 py-1.5 text-sm outline-none focus-visible:ring-2 focus-visible:ring-shallows"
          />
        </div>
      ) : null}
      <button type="submit" disabled={pending} className={buttonClass("primary")}>
        {pending ? "Sharing…" : "Share and e-mail"}
      </button>
      <div aria-live="polite">
        {problem ? (
          <p role="alert" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm">
            {problem}
          </p>
        ) : done ? (
          <p role="status" data-testid="share-done" className="rounded-md border-l-4 border-reed bg-reed/10 px-3 py-2 text-sm">
            {done}
          </p>
        ) : null}
      </div>
    </form>
  );
}
