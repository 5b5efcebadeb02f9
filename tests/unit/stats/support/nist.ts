// Loads NIST StRD linear-regression datasets from tests/fixtures/nist (copied verbatim from
// NIST's Statistical Reference Datasets; see tests/fixtures/nist/README.md for the source).
import { readFileSync } from "node:fs";
import path from "node:path";
import type { ModelSpecification, TermSpecification } from "@/server/stats";

const fixtureDirectory = path.resolve(__dirname, "../../../fixtures/nist");

interface CertifiedParameter {
  name: string;
  estimate: string;
  std_dev: string;
}

interface CertifiedDataset {
  file: string;
  model: string;
  model_class: string;
  intercept: boolean;
  n_parameters: number;
  n_observations: number;
  level_of_difficulty: "lower" | "average" | "higher";
  data_lines: [number, number];
  columns: string[];
  parameters: CertifiedParameter[];
  residual_standard_deviation: string;
  r_squared: string;
}

export interface NistDataset {
  name: string;
  difficulty: "lower" | "average" | "higher";
  specification: ModelSpecification;
  columns: Record<string, Float64Array>;
  certified: {
    parameterNames: string[];
    estimates: number[];
    standardDeviations: number[];
    residualStandardDeviation: number;
    rSquared: number;
  };
}

/** The 11 datasets in NIST's order of difficulty. */
export const nistDatasetNames = [
  "Norris",
  "Pontius",
  "NoInt1",
  "NoInt2",
  "Filip",
  "Longley",
  "Wampler1",
  "Wampler2",
  "Wampler3",
  "Wampler4",
  "Wampler5",
] as const;

/** NIST prints FORTRAN exponents ("0.1E-03"); Number() reads them once the E is an e. */
function parseCertified(text: string): number {
  return Number(text.replace(/E/i, "e"));
}

export function loadNistDataset(name: string): NistDataset {
  const all = JSON.parse(readFileSync(path.join(fixtureDirectory, "certified.json"), "utf8")) as {
    datasets: Record<string, CertifiedDataset>;
  };
  const meta = all.datasets[name];
  const lines = readFileSync(path.join(fixtureDirectory, meta.file), "latin1").split(/\r?\n/);
  // data_lines are 1-based and inclusive.
  const rows = lines
    .slice(meta.data_lines[0] - 1, meta.data_lines[1])
    .map((line) => line.trim().split(/\s+/).map(Number));
  const columnNames = meta.columns;
  const columns: Record<string, Float64Array> = {};
  columnNames.forEach((column, index) => {
    columns[column] = Float64Array.from(rows, (row) => row[index]);
  });
  let terms: TermSpecification[];
  if (columnNames.length === 2) {
    // One predictor: y = b0 + b1 x + b2 x^2 + ... (Norris and NoInt are degree 1, Pontius 2,
    // Wampler 5, Filip 10); powers are computed in double-double by the `power` term.
    const degree = meta.n_parameters - (meta.intercept ? 1 : 0);
    terms = [{ kind: "linear", column: "x" }];
    for (let exponent = 2; exponent <= degree; exponent++) terms.push({ kind: "power", column: "x", exponent });
  } else {
    terms = columnNames.slice(1).map((column) => ({ kind: "linear", column }));
  }
  return {
    name,
    difficulty: meta.level_of_difficulty,
    specification: { outcome: "y", intercept: meta.intercept, terms },
    columns,
    certified: {
      parameterNames: meta.parameters.map((parameter) => parameter.name),
      estimates: meta.parameters.map((parameter) => parseCertified(parameter.estimate)),
      standardDeviations: meta.parameters.map((parameter) => parseCertified(parameter.std_dev)),
      residualStandardDeviation: parseCertified(meta.residual_standard_deviation),
      rSquared: parseCertified(meta.r_squared),
    },
  };
}
