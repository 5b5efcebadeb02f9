import { describe, expect, it } from "vitest";
import { columnLabel, describePlanShape, periodsWord } from "@/server/predict/plan-shape";
import { demoRecord } from "./support";

describe("describePlanShape", () => {
  it("reads spend channels and controls from the fit record, with their observed per-period ranges", () => {
    const record = demoRecord();
    const shape = describePlanShape(record, { periodNoun: "week", outcomeUnit: "EUR" });
    expect(shape.channels.map((channel) => channel.name)).toEqual(["search_eur", "social_eur", "video_eur", "display_eur", "podcast_eur", "email_eur"]);
    expect(shape.channels[0]).toEqual({ name: "search_eur", label: "Search", observed: record.columnRanges.search_eur });
    expect(shape.controls).toEqual([{ name: "promo_week", label: "Promo week", kind: "count", observed: { minimum: 0, maximum: 1 } }]);
    expect(shape.outcome).toEqual({ name: "sales_eur", label: "Sales", unit: "EUR" });
    expect(shape.periodNoun).toBe("week");
  });

  it("treats a control observed beyond 0 and 1 as a level held every period", () => {
    const record = demoRecord();
    const changed = { ...record, columnRanges: { ...record.columnRanges, promo_week: { minimum: 0, maximum: 3 } } };
    expect(describePlanShape(changed).controls[0].kind).toBe("level");
  });
});

describe("columnLabel", () => {
  it("drops a currency or unit suffix and reads underscores as spaces; explicit labels win", () => {
    expect(columnLabel("search_eur")).toBe("Search");
    expect(columnLabel("promo_week")).toBe("Promo week");
    expect(columnLabel("tv_spend")).toBe("Tv");
    expect(columnLabel("video_eur", { video_eur: "Online video" })).toBe("Online video");
  });
});

describe("periodsWord", () => {
  it("keeps one period singular", () => {
    expect(periodsWord(1, "week")).toBe("1 week");
    expect(periodsWord(13, "week")).toBe("13 weeks");
  });
});
