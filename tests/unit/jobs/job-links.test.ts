// GET /api/jobs/{id} links a succeeded job to what it made: the API resource and the page to open.
import { describe, expect, it } from "vitest";
import { jobLinks } from "@/server/jobs/api-shape";

const id = "00000000-0000-4000-8000-000000000001";
const made = "00000000-0000-4000-8000-0000000000aa";

describe("jobLinks", () => {
  it("links a stored spend history and its page (its roles page while roles are missing)", () => {
    expect(jobLinks({ id, kind: "dataset.ingest", status: "succeeded", result: { datasetId: made, status: "ready" } })).toEqual({
      self: `/api/jobs/${id}`,
      dataset: `/api/datasets/${made}`,
      page: `/datasets/${made}`,
    });
    expect(jobLinks({ id, kind: "dataset.ingest", status: "succeeded", result: { datasetId: made, status: "needs-roles" } })).toEqual({
      self: `/api/jobs/${id}`,
      dataset: `/api/datasets/${made}`,
      page: `/datasets/${made}/roles`,
    });
  });

  it("links a stored fit and its page", () => {
    expect(jobLinks({ id, kind: "fit.run", status: "succeeded", result: { fitId: made, n: 10 } })).toEqual({
      self: `/api/jobs/${id}`,
      fit: `/api/fits/${made}`,
      page: `/fits/${made}`,
    });
  });

  it("links only the job itself until it has succeeded", () => {
    for (const status of ["queued", "running", "failed"] as const) {
      expect(jobLinks({ id, kind: "dataset.ingest", status, result: null })).toEqual({ self: `/api/jobs/${id}` });
      expect(jobLinks({ id, kind: "fit.run", status, result: null })).toEqual({ self: `/api/jobs/${id}` });
    }
  });
});
