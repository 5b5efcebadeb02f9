import { describe, expect, it } from "vitest";
import { parseAmountInput } from "@/server/planning/allocation";

const ok = (cents: number) => ({ ok: true, cents });

describe("parseAmountInput", () => {
  it.each([
    ["12,500", "en-IE", 1_250_000],
    ["12500.50", "en-IE", 1_250_050],
    ["12,500.5", "en-US", 1_250_050],
    ["1,234,567.89", "en-US", 123_456_789],
    [" €12,500 ", "en-IE", 1_250_000],
    ["EUR 1,000", "en-IE", 100_000],
    ["1000 eur", "en-IE", 100_000],
    ["41k", "en-IE", 4_100_000],
    ["12.5K", "en-IE", 1_250_000],
    ["1.2m", "en-IE", 120_000_000],
    [".5", "en-IE", 50],
    ["0", "en-IE", 0],
    ["12,50", "en-IE", 1250], // grouping needs three digits, so this comma is a decimal point
    ["12.500,50", "de-DE", 1_250_050],
    ["12.500", "de-DE", 1_250_000],
    ["12500,5", "de-DE", 1_250_050],
    ["12500.50", "de-DE", 1_250_050],
    ["12 500,50", "fr-FR", 1_250_050],
    ["12\u202f500,50", "fr-FR", 1_250_050],
    ["1'234.50", "de-CH", 123_450],
    ["1’234.50", "de-CH", 123_450],
  ])("reads %j in %s", (text, locale, cents) => {
    expect(parseAmountInput(text, locale)).toEqual(ok(cents));
  });

  it.each([
    ["", "Enter an amount."],
    ["   ", "Enter an amount."],
    ["-5", "Spend can't be negative."],
    ["−5", "Spend can't be negative."],
    ["(500)", "Spend can't be negative."],
    ["abc", "Enter an amount like 12,500 or 12,500.50."],
    ["1,2,3", "Enter an amount like 12,500 or 12,500.50."],
    ["12..5", "Enter an amount like 12,500 or 12,500.50."],
    ["12.345", "Amounts go to the cent: use at most two decimals. Enter an amount like 12,500 or 12,500.50."],
    ["1e5", "Enter an amount like 12,500 or 12,500.50."],
    ["99999999999999999999", "That amount is too large."],
  ])("rejects %j with a sentence", (text, message) => {
    expect(parseAmountInput(text, "en-IE")).toEqual({ ok: false, message });
  });

  it("words the example in the workspace locale", () => {
    expect(parseAmountInput("x", "de-DE")).toEqual({ ok: false, message: "Enter an amount like 12.500 or 12.500,50." });
  });
});
