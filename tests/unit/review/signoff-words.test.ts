// The words of the sign-off summary (scenarios list, scenario header) and of the read-only room's banner.
import { describe, expect, it } from "vitest";
import type { ScenarioSignoffSummaryDto, SignoffDto } from "@/server/signoffs/types";
import { earlierSignoffText, signoffSummaryLabel } from "@/ui/compare/signoff-summary";
import { readOnlyActions } from "@/ui/scenario/read-only-banner";

const decision = (version: number, kind: SignoffDto["decision"], reason = ""): SignoffDto => ({
  id: `d${version}`,
  scenarioId: "s",
  version,
  decision: kind,
  reason,
  decidedById: "u",
  decidedByName: "Felix Brandt",
  decidedAt: "2026-12-01T10:00:00.000Z",
});

const summary = (fields: Partial<ScenarioSignoffSummaryDto>): ScenarioSignoffSummaryDto => ({
  scenarioId: "s",
  latestVersion: 3,
  state: "not_shared",
  latestDecision: null,
  earlierSignedOff: null,
  ...fields,
});

describe("sign-off summary words", () => {
  it("names the latest version's state", () => {
    expect(signoffSummaryLabel(summary({ state: "signed_off", latestDecision: decision(3, "signed_off") }))).toBe("Signed off v3 by Felix Brandt");
    expect(signoffSummaryLabel(summary({ state: "declined", latestDecision: decision(3, "declined", "Too much") }))).toBe("Declined v3 by Felix Brandt");
    expect(signoffSummaryLabel(summary({ state: "awaiting" }))).toBe("Awaiting sign-off of v3");
    expect(signoffSummaryLabel(summary({ state: "not_shared" }))).toBe("v3 not shared with finance");
    expect(signoffSummaryLabel(summary({ state: "no_version", latestVersion: null }))).toBe("No version saved");
  });

  it("says when an earlier version is signed off but the latest is not", () => {
    expect(earlierSignoffText(summary({ earlierSignedOff: decision(2, "signed_off") }))).toBe("v2 signed off; v3 not signed off");
    expect(earlierSignoffText(summary({}))).toBeNull();
  });
});

describe("read-only banner", () => {
  it("lists what the member can still do, from their permissions", () => {
    expect(readOnlyActions({ compare: true, comment: true, decide: true })).toBe(
      "You can open any saved version from Version history, put versions side by side and comment on, sign off or decline versions shared with you in Finance review below.",
    );
    expect(readOnlyActions({ compare: true, comment: false, decide: false })).toBe("You can open any saved version from Version history and put versions side by side.");
    expect(readOnlyActions({ compare: false, comment: false, decide: false })).toBe("You can open any saved version from Version history.");
  });
});
