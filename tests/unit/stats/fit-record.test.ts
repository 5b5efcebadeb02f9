// Fit records: JSON round trip, checksum, and predictions identical to the fit's.
// SHA-256 is checked against node:crypto (an independent implementation) and the FIPS 180-4
// example digests.
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import {
  type FitRecord,
  canonicalJson,
  createFitRecord,
  fitModel,
  parseFitRecord,
  predict,
  predictDifference,
  predictFromRecord,
  predictTotal,
  sha256Hex,
  verifyFitRecord,
} from "@/server/stats";
import { marketingData } from "./support/random";

const data = marketingData(80, 4242);
const specification = {
  outcome: "sales",
  intercept: true,
  terms: [
    { kind: "log1p" as const, column: "tv" },
    { kind: "linear" as const, column: "radio" },
    { kind: "interaction" as const, columns: ["tv", "radio"] as const },
    { kind: "control" as const, column: "price", name: "unit price" },
  ],
};
const fit = fitModel(specification, data, { covariance: { type: "hc3" }, confidenceLevel: 0.9 });
const record = createFitRecord(fit);
const point = { tv: 140, radio: 33, price: 10.1 };

describe("createFitRecord", () => {
  it("is versioned, plain JSON (no typed arrays) and complete enough to predict", () => {
    expect(record.version).toBe(1);
    expect(JSON.parse(JSON.stringify(record))).toEqual(record);
    expect(record.termNames).toEqual(["(Intercept)", "log1p(tv)", "radio", "tv:radio", "unit price"]);
    expect(record.covarianceType).toBe("hc3");
    expect(record.confidenceLevel).toBe(0.9);
    expect(record.inverseUpper.map((row) => row.length)).toEqual([5, 4, 3, 2, 1]);
    expect(Object.keys(record.columnRanges).sort()).toEqual(["price", "radio", "tv"]);
    expect(record.checksum).toMatch(/^sha256:[0-9a-f]{64}$/);
  });

  it("predicts exactly what the fit predicts, after a JSON round trip", () => {
    const restored = JSON.parse(JSON.stringify(record)) as FitRecord;
    expect(predictFromRecord(restored, point)).toEqual(predict(fit, point));
    const plan = { points: [point, { ...point, tv: 60 }] };
    expect(predictTotal(restored, plan)).toEqual(predictTotal(fit, plan));
    expect(predictDifference(restored, plan, { point, periods: 2 })).toEqual(predictDifference(fit, plan, { point, periods: 2 }));
  });

  it("uses the fit's covariance choice for the mean's interval and s² for the new observation", () => {
    const prediction = predictFromRecord(record, point);
    expect(prediction.confidenceLevel).toBe(0.9);
    const variance = prediction.standardErrorOfMean ** 2;
    expect(prediction.standardErrorOfPrediction ** 2).toBeCloseTo(variance + record.residualStandardError ** 2, 8);
  });

  it("predicts from a record in microseconds", () => {
    const restored = JSON.parse(JSON.stringify(record)) as FitRecord;
    predictFromRecord(restored, point);
    const repetitions = 20000;
    const start = performance.now();
    for (let index = 0; index < repetitions; index++) predictFromRecord(restored, { ...point, tv: 50 + (index % 150) });
    const microseconds = ((performance.now() - start) * 1000) / repetitions;
    console.log(`predictFromRecord: ${microseconds.toFixed(2)} µs per prediction (p = 5)`);
    expect(microseconds).toBeGreaterThan(0);
  });
});

describe("verifyFitRecord and parseFitRecord", () => {
  it("accept an untouched record, also after a JSON round trip", () => {
    const restored = JSON.parse(JSON.stringify(record)) as unknown;
    expect(verifyFitRecord(restored as FitRecord)).toBe(true);
    expect(parseFitRecord(restored)).toEqual(record);
  });

  it("detect a changed digit in a coefficient, a covariance entry or a range", () => {
    const tamperedCoefficient = structuredClone(record);
    tamperedCoefficient.coefficients[2] *= 1 + 1e-15;
    expect(verifyFitRecord(tamperedCoefficient)).toBe(false);
    expect(() => parseFitRecord(tamperedCoefficient)).toThrow(
      "parseFitRecord requires a checksum that matches the content (the record was altered)",
    );
    const tamperedCovariance = structuredClone(record);
    tamperedCovariance.covariance[1][1] = tamperedCovariance.covariance[1][1] / 2;
    expect(verifyFitRecord(tamperedCovariance)).toBe(false);
    const tamperedRange = structuredClone(record);
    tamperedRange.columnRanges.tv.maximum += 1;
    expect(verifyFitRecord(tamperedRange)).toBe(false);
  });

  it("reject malformed records with a reason", () => {
    expect(() => parseFitRecord({ ...record, version: 2 })).toThrow("parseFitRecord requires version 1 (got 2)");
    expect(() => parseFitRecord({ ...record, coefficients: record.coefficients.slice(1) })).toThrow(
      "parseFitRecord requires 5 finite coefficients",
    );
    expect(() => parseFitRecord("not a record")).toThrow("parseFitRecord requires an object");
  });
});

describe("canonicalJson and sha256Hex", () => {
  it("serialise keys in sorted order, so key order does not change the checksum", () => {
    expect(canonicalJson({ b: 1, a: [true, null, "x"], c: { z: 0.1, y: -2e-300 } })).toBe(
      '{"a":[true,null,"x"],"b":1,"c":{"y":-2e-300,"z":0.1}}',
    );
    expect(() => canonicalJson({ a: Number.NaN })).toThrow("canonicalJson requires finite numbers (got NaN)");
  });

  it("matches the FIPS 180-4 examples and node:crypto", () => {
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
    for (const text of ["abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "é€𝄞", "x".repeat(55), "y".repeat(64), canonicalJson(record)]) {
      expect(sha256Hex(text)).toBe(createHash("sha256").update(text, "utf8").digest("hex"));
    }
  });
});
