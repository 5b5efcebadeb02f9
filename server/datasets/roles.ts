import "server-only";
import { z } from "zod";
import { preview, readCell, readPeriod, type DateOrder } from "./cells";
import { defaultReadLimits } from "./csv-reader";
import { cellText, type ColumnProfile, type ColumnStore } from "./inspect";
import { DEFAULT_PROBLEM_LIMIT, type ProblemList } from "./problems";

/**
 * Phase 2, "assign roles": the rules that depend on what each column is for. Roles are given by
 * column name; columns not named are ignored. Exactly one outcome, at least one spend channel, at
 * most one period; controls are optional. Each column may carry a unit (a currency code such as
 * "EUR" for money, or "orders", "°C"...).
 */

export const columnRoles = ["outcome", "spend", "control", "period", "ignored"] as const;
export type ColumnRole = (typeof columnRoles)[number];
export const numericRoles: readonly ColumnRole[] = ["outcome", "spend", "control"];

export const missingPolicies = ["reject", "drop-incomplete-rows"] as const;
export type MissingPolicy = (typeof missingPolicies)[number];

export const columnAssignmentSchema = z
  .object({
    role: z.enum(columnRoles),
    unit: z.string().trim().min(1).max(32).optional(),
  })
  .strict();
export type ColumnAssignment = z.infer<typeof columnAssignmentSchema>;

/** Roles by column name, e.g. `{ "Sales": { "role": "outcome", "unit": "EUR" }, "TV": { "role": "spend" } }`. */
export const roleAssignmentSchema = z.record(z.string().min(1).max(500), columnAssignmentSchema);
export type RoleAssignment = z.infer<typeof roleAssignmentSchema>;

/** Options of an upload (validate at the boundary with this schema; every field has a default). */
export const datasetOptionsSchema = z
  .object({
    /** Roles now (the upload then checks everything and is `ready`), or later with assignDatasetRoles. */
    roles: roleAssignmentSchema.optional(),
    missingPolicy: z.enum(missingPolicies).default("reject"),
    /** Fewest rows (after dropping incomplete ones); default: terms + 2, terms = spend + controls + intercept. */
    minRows: z.number().int().min(1).max(100_000_000).optional(),
    /** How to read dates such as 03/01/2024 (ISO dates are always read). */
    dateOrder: z.enum(["YMD", "DMY", "MDY"]).default("YMD"),
    /** Size limit in bytes (default 200 MB, at most 1 GB). */
    maxBytes: z
      .number()
      .int()
      .min(1)
      .max(1024 * 1024 * 1024)
      .default(defaultReadLimits.maxBytes),
    /** How many problems a report lists (all are counted). */
    maxProblems: z.number().int().min(1).max(1000).default(DEFAULT_PROBLEM_LIMIT),
  })
  .strict();
export type DatasetOptionsInput = z.input<typeof datasetOptionsSchema>;

/** Roles given after the upload (assignDatasetRoles); unset rules keep the dataset's. */
export const assignRolesSchema = z
  .object({
    roles: roleAssignmentSchema,
    missingPolicy: z.enum(missingPolicies).optional(),
    minRows: z.number().int().min(1).max(100_000_000).optional(),
    dateOrder: z.enum(["YMD", "DMY", "MDY"]).optional(),
  })
  .strict();
export type AssignRolesOptions = z.input<typeof assignRolesSchema>;
export type DatasetOptions = z.output<typeof datasetOptionsSchema>;

export type ResolvedColumn = { role: ColumnRole; unit: string | null };

export type RoleCheck = {
  /** Role and unit of every column by position (index 0 = column 1). */
  columns: ResolvedColumn[];
  /** Rows dropped by the "drop-incomplete-rows" policy (0-based row indexes). */
  droppedRows: number[];
  keptRowCount: number;
  minRows: number;
};

export type RoleCheckInput = {
  store: ColumnStore;
  columns: Pick<ColumnProfile, "name" | "kind" | "numericCount" | "textCount" | "min" | "max">[];
  dateOrder: DateOrder;
};

const listNames = (names: string[]) =>
  names.length <= 12 ? names.map((n) => `“${n}”`).join(", ") : `${names.slice(0, 12).map((n) => `“${n}”`).join(", ")}, …`;

/** Finds a column by name: exact (trimmed) first, then ignoring case. */
function resolveColumn(names: string[], name: string): number {
  const wanted = name.trim();
  const exact = names.indexOf(wanted);
  if (exact >= 0) return exact;
  const lower = wanted.toLowerCase();
  return names.findIndex((n) => n.toLowerCase() === lower);
}

/** Checks the role-dependent rules, adding every problem to `problems`. */
export function checkRoles(
  input: RoleCheckInput,
  roles: RoleAssignment,
  rules: { missingPolicy: MissingPolicy; minRows?: number },
  problems: ProblemList,
): RoleCheck {
  const { store, columns, dateOrder } = input;
  const names = store.names;
  const n = store.rowCount;
  const resolved: ResolvedColumn[] = names.map(() => ({ role: "ignored", unit: null }));
  const given = new Array<boolean>(names.length).fill(false);

  for (const [name, assignment] of Object.entries(roles)) {
    const j = resolveColumn(names, name);
    if (j < 0) {
      problems.add({
        kind: "unknown-column",
        message: `There is no column “${preview(name)}”; the columns are ${listNames(names)}.`,
        path: `roles.${name}`,
      });
      continue;
    }
    if (given[j]) {
      problems.add({
        kind: "invalid-roles",
        message: `Column ${j + 1} “${names[j]}” is given a role twice.`,
        path: `roles.${name}`,
        column: j + 1,
        columnName: names[j],
      });
      continue;
    }
    given[j] = true;
    resolved[j] = { role: assignment.role, unit: assignment.unit ?? null };
  }

  const withRole = (role: ColumnRole) => resolved.flatMap((c, j) => (c.role === role ? [j] : []));
  const outcome = withRole("outcome");
  const spend = withRole("spend");
  const controls = withRole("control");
  const period = withRole("period");
  if (outcome.length !== 1) {
    problems.add({
      kind: "invalid-roles",
      message:
        outcome.length === 0
          ? "Choose the outcome column (what the spend should explain, e.g. weekly sales)."
          : `Only one column can be the outcome; ${listNames(outcome.map((j) => names[j]))} are.`,
      path: "roles",
    });
  }
  if (spend.length === 0) {
    problems.add({ kind: "invalid-roles", message: "Choose at least one spend channel column.", path: "roles" });
  }
  if (period.length > 1) {
    problems.add({
      kind: "invalid-roles",
      message: `Only one column can be the period; ${listNames(period.map((j) => names[j]))} are.`,
      path: "roles",
    });
  }

  const incomplete = rules.missingPolicy === "drop-incomplete-rows" ? new Uint8Array(n) : null;
  const missingCell = (i: number, j: number) => {
    if (incomplete) {
      incomplete[i] = 1;
      return;
    }
    problems.add({
      kind: "missing-value",
      message: `Row ${i + 1}, column ${j + 1} “${names[j]}” is empty; fill it in, or choose to drop incomplete rows.`,
      row: i + 1,
      line: store.lines[i],
      column: j + 1,
      columnName: names[j],
    });
  };

  const numericColumns = [...outcome, ...spend, ...controls].sort((a, b) => a - b);
  const usable = new Set<number>();
  for (const j of numericColumns) {
    const role = resolved[j].role;
    const values = store.values[j];
    const profile = columns[j];
    if (profile.numericCount === 0) {
      let first: string | undefined;
      for (let i = 0; i < n && first === undefined; i++) first = cellText(store, j, i);
      problems.add({
        kind: "non-numeric",
        message:
          first === undefined
            ? `Column ${j + 1} “${names[j]}” is empty; it cannot be ${role === "outcome" ? "the outcome" : `a ${role} column`}.`
            : `Column ${j + 1} “${names[j]}” holds no numbers (e.g. “${preview(first)}”); it cannot be ${role === "outcome" ? "the outcome" : `a ${role} column`}.`,
        column: j + 1,
        columnName: names[j],
      });
      continue;
    }
    usable.add(j);
    // the column's profile already says when no cell can be a problem: a number in every row, and no
    // negative one where spend is meant (the usual case, which then costs no pass over the rows)
    if (profile.numericCount === n && (role !== "spend" || (profile.min ?? 0) >= 0)) continue;
    for (let i = 0; i < n; i++) {
      const x = values[i];
      if (x !== x) {
        const text = cellText(store, j, i);
        if (text === undefined) {
          missingCell(i, j);
          continue;
        }
        const reading = readCell(text);
        const kind = reading.kind === "number" || reading.kind === "missing" ? "non-numeric" : reading.kind;
        const hint = "hint" in reading ? reading.hint : "it is not a number";
        problems.add({
          kind,
          message: `Row ${i + 1}, column ${j + 1} “${names[j]}”: “${preview(text)}” is not a usable number: ${hint}.`,
          row: i + 1,
          line: store.lines[i],
          column: j + 1,
          columnName: names[j],
          value: preview(text),
        });
      } else if (role === "spend" && x < 0) {
        problems.add({
          kind: "negative-spend",
          message: `Row ${i + 1}, column ${j + 1} “${names[j]}”: spend is negative (${x}).`,
          row: i + 1,
          line: store.lines[i],
          column: j + 1,
          columnName: names[j],
          value: String(x),
        });
      }
    }
  }

  if (period.length === 1) {
    const j = period[0];
    const values = store.values[j];
    const texts = store.texts[j];
    const dates = store.dates?.[j] ?? null;
    const numeric = columns[j].kind === "numeric";
    const cached = store.periodDateOrder === dateOrder ? store.periodDays?.[j] : null;
    const keys = new Float64Array(n).fill(NaN);
    for (let i = 0; i < n; i++) {
      const x = values[i];
      const text = texts?.[i];
      let key = NaN;
      if (numeric) {
        if (x === x && Number.isInteger(x)) key = x;
      } else if (dates !== null && dates[i] === dates[i]) {
        key = dates[i];
      } else if (text !== undefined) {
        key = cached ? cached[i] : readPeriod(text, dateOrder);
      }
      if (key === key) {
        keys[i] = key;
        continue;
      }
      if (x !== x && text === undefined) {
        missingCell(i, j);
        continue;
      }
      const shown = text ?? String(x);
      problems.add({
        kind: "unparseable-period",
        message: numeric
          ? `Row ${i + 1}, column ${j + 1} “${names[j]}”: “${preview(shown)}” is not a whole number (a numeric period column holds week or year numbers).`
          : `Row ${i + 1}, column ${j + 1} “${names[j]}”: “${preview(shown)}” is not a date; write dates as YYYY-MM-DD${dateOrder === "YMD" ? " (or choose the date order DMY/MDY for dates such as 31/01/2024)" : ""}.`,
        row: i + 1,
        line: store.lines[i],
        column: j + 1,
        columnName: names[j],
        value: preview(shown),
      });
    }
    // repeated periods: none when every period is later than the one before (the usual history, and
    // no sort needed); otherwise a sorted copy finds whether there are any; only then find which rows
    let ascending = true;
    let increasing = true;
    let previous = -Infinity;
    for (let i = 0; i < n; i++) {
      const key = keys[i];
      if (key !== key) continue;
      if (key < previous) ascending = false;
      if (key <= previous) increasing = false;
      previous = key;
    }
    let repeated = false;
    if (!increasing) {
      const sorted = keys.slice().sort(); // NaN sorts last
      for (let i = 1; i < n && sorted[i] === sorted[i]; i++) {
        if (sorted[i] === sorted[i - 1]) {
          repeated = true;
          break;
        }
      }
    }
    if (repeated) {
      const firstRowOf = new Map<number, number>();
      for (let i = 0; i < n; i++) {
        const key = keys[i];
        if (key !== key) continue;
        const first = firstRowOf.get(key);
        if (first === undefined) {
          firstRowOf.set(key, i);
          continue;
        }
        const shown = cellText(store, j, i) ?? String(values[i]);
        problems.add({
          kind: "duplicate-period",
          message: `Row ${i + 1}, column ${j + 1} “${names[j]}”: the period “${preview(shown)}” is also in row ${first + 1}; each period must appear once.`,
          row: i + 1,
          line: store.lines[i],
          column: j + 1,
          columnName: names[j],
          value: preview(shown),
        });
      }
    }
    if (!ascending) {
      problems.note({
        kind: "periods-not-ascending",
        message: `The rows are not in period order; fits and time plots use period order.`,
        column: j + 1,
        columnName: names[j],
      });
    }
  }

  const droppedRows: number[] = [];
  if (incomplete) for (let i = 0; i < n; i++) if (incomplete[i]) droppedRows.push(i);
  const keptRowCount = n - droppedRows.length;
  if (droppedRows.length > 0) {
    const shown = droppedRows.slice(0, 20).map((i) => i + 1);
    problems.note({
      kind: "dropped-incomplete-rows",
      message: `${droppedRows.length} incomplete ${droppedRows.length === 1 ? "row was" : "rows were"} dropped (rows ${shown.join(", ")}${droppedRows.length > 20 ? ", …" : ""}).`,
      count: droppedRows.length,
      rows: shown,
    });
  }

  const terms = spend.length + controls.length + 1;
  const minRows = rules.minRows ?? terms + 2;
  if (keptRowCount < minRows) {
    problems.add({
      kind: "too-few-rows",
      message:
        `The data has ${keptRowCount} ${keptRowCount === 1 ? "row" : "rows"}` +
        (droppedRows.length > 0 ? ` after dropping ${droppedRows.length} incomplete` : "") +
        `; at least ${minRows} are needed` +
        (rules.minRows === undefined ? ` (${terms} terms: ${spend.length} spend, ${controls.length} control${controls.length === 1 ? "" : "s"} and the intercept, plus 2).` : "."),
    });
  }

  for (const j of numericColumns) {
    if (!usable.has(j)) continue;
    const values = store.values[j];
    let lo = Infinity;
    let hi = -Infinity;
    // with every row kept, the profile's range is the range (no pass over the rows)
    if (droppedRows.length === 0) {
      lo = columns[j].min ?? Infinity;
      hi = columns[j].max ?? -Infinity;
    } else for (let i = 0; i < n; i++) {
      if (incomplete && incomplete[i]) continue;
      const x = values[i];
      if (x === x) {
        if (x < lo) lo = x;
        if (x > hi) hi = x;
      }
    }
    if (lo === hi) {
      problems.add({
        kind: "constant-column",
        message: `Column ${j + 1} “${names[j]}” has the same value (${lo}) in every row; a constant cannot be ${resolved[j].role === "outcome" ? "explained" : "used to explain anything"}.`,
        column: j + 1,
        columnName: names[j],
      });
    }
  }

  return { columns: resolved, droppedRows, keptRowCount, minRows };
}
