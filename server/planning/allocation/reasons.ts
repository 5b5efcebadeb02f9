/** Builds the plain sentences that say why a control stopped. */
import type { Slot } from "./distribute";
import type { AllocationChannel, Blocker, CentsFormatter } from "./types";

const list = new Intl.ListFormat("en", { style: "long", type: "conjunction" });

/**
 * Who stopped a move: locked channels, and unlocked ones sitting at the bound in the direction the
 * others had to move (`othersDirection` -1 = others had to give money, +1 = take money).
 */
export function findBlockers(
  channels: readonly AllocationChannel[],
  movedIndex: number | null,
  others: readonly { index: number; slot: Slot }[],
  newAmounts: readonly number[],
  othersDirection: 1 | -1,
): Blocker[] {
  const blockers: Blocker[] = [];
  for (const { index, slot } of others) {
    const channel = channels[index];
    const amount = newAmounts[index];
    if (othersDirection < 0 && amount <= slot.lowCents) {
      blockers.push({ name: channel.name, label: channel.label, kind: slot.lowCents > 0 ? "at-floor" : "at-zero" });
    } else if (othersDirection > 0 && amount >= slot.highCents) {
      blockers.push({ name: channel.name, label: channel.label, kind: "at-ceiling" });
    }
  }
  channels.forEach((channel, index) => {
    if (index !== movedIndex && channel.locked) blockers.push({ name: channel.name, label: channel.label, kind: "locked" });
  });
  return blockers;
}

const phrases: Record<Blocker["kind"], [one: string, many: string]> = {
  "at-floor": ["is at its floor", "are at their floors"],
  "at-zero": ["is at zero", "are at zero"],
  "at-ceiling": ["is at its ceiling", "are at their ceilings"],
  locked: ["is locked", "are locked"],
};

/** "Search and Video are at their floors, Radio is locked" — grouped by kind, in channel order. */
export function describeBlockers(blockers: readonly Blocker[]): string {
  if (blockers.length === 0) return "there is no other channel to move";
  const parts: string[] = [];
  for (const kind of ["at-floor", "at-zero", "at-ceiling", "locked"] as const) {
    const labels = blockers.filter((blocker) => blocker.kind === kind).map((blocker) => blocker.label);
    if (labels.length === 0) continue;
    parts.push(`${list.format(labels)} ${phrases[kind][labels.length === 1 ? 0 : 1]}`);
  }
  return parts.join(", ");
}

/**
 * Sentence for a move the other channels could not absorb.
 * Part-way: "Only €1,200 can move: …"; already at the limit: "Search can't go higher than €45,000: …".
 */
export function othersExhaustedMessage(args: {
  label: string;
  movedCents: number;
  limitCents: number;
  up: boolean;
  causes: readonly string[];
  format: CentsFormatter;
  movedWord?: string;
}): string {
  const why = args.causes.join(", ");
  if (args.movedCents > 0) return `Only ${args.format(args.movedCents)} ${args.movedWord ?? "can move"}: ${why}.`;
  return `${args.label} can't go ${args.up ? "higher" : "lower"} than ${args.format(args.limitCents)}: ${why}.`;
}

/** Sentence for a request cut by the channel's own bound. */
export function ownBoundMessage(
  label: string,
  kind: "own-floor" | "own-ceiling" | "negative",
  boundCents: number,
  format: CentsFormatter,
): string {
  if (kind === "negative") return `${label} can't go below ${format(0)}: spend can't be negative.`;
  if (kind === "own-floor") return `${label} can't go below its floor (${format(boundCents)}).`;
  return `${label} can't go above its ceiling (${format(boundCents)}).`;
}

/** Sentence for an edit on a locked channel. */
export function lockedMessage(label: string): string {
  return `${label} is locked; unlock it to change its spend.`;
}
