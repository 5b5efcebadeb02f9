import { describe, expect, it } from "vitest";
import {
  centsFormatter,
  createAllocationState,
  moveChannel,
  setBounds,
  setLocked,
  setMode,
  setTotal,
  toggleLock,
  validateAllocation,
  type AllocationChannel,
  type AllocationState,
} from "@/server/planning/allocation";

const eur = centsFormatter({ currency: "EUR", locale: "en-IE" });
const ch = (name: string, amountCents: number, extra: Partial<AllocationChannel> = {}): AllocationChannel => ({
  name,
  label: name[0].toUpperCase() + name.slice(1),
  amountCents,
  locked: false,
  ...extra,
});
const amounts = (state: AllocationState) => state.channels.map((c) => c.amountCents);
const start = createAllocationState({
  horizonPeriods: 13,
  channels: [ch("search", 6_000_000), ch("video", 3_000_000), ch("radio", 1_000_000)],
});

describe("setTotal", () => {
  it("scales the unlocked channels proportionally, exactly", () => {
    const { state } = setTotal(start, 12_000_000);
    expect(amounts(state)).toEqual([7_200_000, 3_600_000, 1_200_000]);
    expect(state.totalCents).toBe(12_000_000);
  });

  it("keeps locked channels and respects floors, with a reason when the total can't be reached", () => {
    const locked = setLocked(setBounds(start, "video", { floorCents: 2_000_000 }).state, "radio", true).state;
    const { state, reason } = setTotal(locked, 1_000_000, { format: eur });
    expect(amounts(state)).toEqual([0, 2_000_000, 1_000_000]);
    expect(state.totalCents).toBe(3_000_000);
    expect(reason?.message).toBe("The total can only go down to €30,000: Video is at its floor, Search is at zero, Radio is locked.");
  });

  it("caps at the ceiling in growing mode", () => {
    const growing = setMode(start, "growing").state;
    const { state, reason } = setTotal(growing, 50_000_000, { format: eur });
    expect(state.totalCents).toBe(growing.ceilingCents);
    expect(reason?.kind).toBe("total-ceiling");
  });
});

describe("locks, bounds and mode", () => {
  it("toggles a lock without touching amounts", () => {
    const locked = toggleLock(start, "video").state;
    expect(locked.channels[1].locked).toBe(true);
    expect(amounts(locked)).toEqual(amounts(start));
    expect(toggleLock(locked, "video").state.channels[1].locked).toBe(false);
  });

  it("accepts bounds the amount already meets", () => {
    const { state, reason } = setBounds(start, "search", { floorCents: 1_000_000, ceilingCents: 8_000_000 });
    expect(reason).toBeUndefined();
    expect(state.channels[0]).toMatchObject({ floorCents: 1_000_000, ceilingCents: 8_000_000, amountCents: 6_000_000 });
  });

  it("moves a channel up to a new floor, the others paying for it", () => {
    const { state } = setBounds(start, "radio", { floorCents: 2_000_000 });
    expect(amounts(state)).toEqual([5_333_333, 2_666_667, 2_000_000]);
    expect(state.totalCents).toBe(start.totalCents);
  });

  it("refuses bounds that cannot be met, or that make no sense, and changes nothing", () => {
    const lockedRadio = setLocked(start, "radio", true).state;
    expect(setBounds(lockedRadio, "radio", { floorCents: 2_000_000 }, { format: eur })).toEqual({
      state: lockedRadio,
      reason: { kind: "invalid", channel: "radio", message: "Radio is locked at €10,000, outside those bounds; unlock it first." },
    });
    const tooHigh = setBounds(lockedRadio, "search", { floorCents: 9_500_000 }, { format: eur });
    expect(tooHigh.state).toBe(lockedRadio);
    expect(tooHigh.reason?.message).toContain("Search can't be moved to €95,000");
    expect(setBounds(start, "search", { floorCents: 5, ceilingCents: 4 }).reason?.message).toMatch(/floor .* is above its ceiling/);
    expect(setBounds(start, "search", { floorCents: -1 }).reason?.message).toBe("Search's floor can't be negative.");
  });

  it("switches modes without changing amounts and keeps the ceiling above the total", () => {
    const raised = setTotal(start, 20_000_000).state;
    const growing = setMode(raised, "growing").state;
    expect(growing.mode).toBe("growing");
    expect(amounts(growing)).toEqual(amounts(raised));
    expect(growing.ceilingCents).toBe(20_000_000);
    expect(moveChannel(growing, "search", 1).state.totalCents).toBe(20_000_000 - 11_999_999);
  });
});

describe("validateAllocation", () => {
  it("accepts a consistent allocation", () => {
    expect(validateAllocation(start)).toEqual({ ok: true, problems: [] });
  });

  it("allows ±0.01 in fixed mode and reports larger gaps", () => {
    expect(validateAllocation({ ...start, totalCents: start.totalCents + 1 }).ok).toBe(true);
    const off = validateAllocation({ ...start, totalCents: start.totalCents + 2 }, { format: eur });
    expect(off.problems).toEqual([{ path: "total", message: "The channels add up to €100,000, but the fixed total is €100,000.02." }]);
  });

  it("reports negatives, bounds, fractions, duplicates and the ceiling", () => {
    const bad: AllocationState = {
      ...start,
      mode: "growing",
      ceilingCents: 100,
      channels: [
        ch("search", -500),
        ch("video", 100, { floorCents: 200 }),
        ch("radio", 900, { ceilingCents: 800 }),
        ch("radio", 0.5),
      ],
      totalCents: 500,
    };
    const messages = validateAllocation(bad, { format: eur }).problems.map((p) => `${p.path}: ${p.message}`);
    expect(messages).toEqual([
      "channels.search.amount: Search's spend can't be negative (-€5).",
      "channels.video.amount: Video (€1) is below its floor (€2).",
      "channels.radio.amount: Radio (€9) is above its ceiling (€8).",
      "channels.radio: Radio appears more than once.",
      "channels.radio.amount: Radio's amount must be in whole cents.",
      "total: The channels add up to €5.01, but the total says €5.",
      "ceiling: The total (€5.01) is above the ceiling (€1).",
    ]);
  });
});
