import { formatCentsPlain } from "./money";

/** Outcome of reading what a planner typed into an amount field. */
export type ParsedAmount = { ok: true; cents: number } | { ok: false; message: string };

interface Separators {
  group: string;
  decimal: string;
}

const separatorCache = new Map<string, Separators>();

/** The locale's grouping and decimal characters, read from Intl so every workspace locale works. */
export function localeSeparators(locale: string): Separators {
  let found = separatorCache.get(locale);
  if (!found) {
    const parts = new Intl.NumberFormat(locale).formatToParts(1234567.5);
    found = {
      group: parts.find((part) => part.type === "group")?.value ?? ",",
      decimal: parts.find((part) => part.type === "decimal")?.value ?? ".",
    };
    separatorCache.set(locale, found);
  }
  return found;
}

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
const SPACES = /[\s\u00a0\u202f\u2009]/g;
const IS_SPACE = /^[\s\u00a0\u202f\u2009]$/;

/**
 * Reads an amount typed in the workspace locale into integer cents.
 *
 * Accepts the locale's own form ("12,500", "12,500.50" in en; "12.500,50" in de), plain digits with a
 * one- or two-digit decimal part using either "." or "," ("12500.50", "12500,50": unambiguous because
 * grouping needs three digits), an optional currency sign or code ("€12,500", "12500 EUR") and a
 * k/m suffix ("41k" = 41,000). Rejects negatives, more than two decimals and anything else, with a
 * sentence the field can show; the caller then leaves the allocation unchanged.
 */
export function parseAmountInput(text: string, locale: string): ParsedAmount {
  const example = `Enter an amount like ${formatCentsPlain(1_250_000, locale)} or ${formatCentsPlain(1_250_050, locale)}.`;
  let s = text.trim();
  if (s === "") return { ok: false, message: "Enter an amount." };
  if (/^[-−(]|[-−)]$/.test(s.replace(/\p{Sc}/gu, "").trim())) return { ok: false, message: "Spend can't be negative." };

  s = s.replace(/\p{Sc}/gu, "").replace(/^[A-Za-z]{3}(?=[\d\s.,])/, "").replace(/(?<=[\d\s.,])[A-Za-z]{3}$/, "");
  const { group, decimal } = localeSeparators(locale);
  // Space-like group separators (fr, sv…) are removed with the other spaces.
  s = s.replace(SPACES, "");

  let multiplier = 1n;
  const suffix = /^(.*\d)([kKmM])$/.exec(s);
  if (suffix) {
    s = suffix[1];
    multiplier = suffix[2].toLowerCase() === "k" ? 1_000n : 1_000_000n;
  }

  const groupChar = IS_SPACE.test(group) ? "" : group;
  // Swiss grouping is typed with either apostrophe, whichever the keyboard gives.
  if (/^['’]$/.test(groupChar)) s = s.replace(/['’]/g, groupChar);
  const d = escape(decimal);
  const strict = groupChar
    ? new RegExp(`^(\\d{1,3}(?:${escape(groupChar)}\\d{3})+|\\d+)?(?:${d}(\\d+))?$`)
    : new RegExp(`^(\\d+)?(?:${d}(\\d+))?$`);
  let integer: string | undefined;
  let fraction: string | undefined;
  const strictMatch = strict.exec(s);
  if (strictMatch && (strictMatch[1] || strictMatch[2])) {
    integer = (strictMatch[1] ?? "0").split(groupChar || "\u0000").join("");
    fraction = strictMatch[2] ?? "";
  } else {
    const loose = /^(\d+)[.,](\d{1,2})$/.exec(s);
    if (!loose) return { ok: false, message: example };
    integer = loose[1];
    fraction = loose[2];
  }

  const scale = BigInt(fraction.length);
  const numerator = BigInt(integer + fraction) * 100n * multiplier;
  const denominator = 10n ** scale;
  if (numerator % denominator !== 0n) {
    return { ok: false, message: `Amounts go to the cent: use at most two decimals. ${example}` };
  }
  const cents = numerator / denominator;
  if (cents > BigInt(Number.MAX_SAFE_INTEGER)) return { ok: false, message: "That amount is too large." };
  return { ok: true, cents: Number(cents) };
}
