// The sign-off summary of the scenarios list and the scenario header, against real PostgreSQL: the
// latest version's state (not shared → awaiting when shared directly or in a shared comparison →
// signed off / declined), a newer version starting undecided with the earlier sign-off named, no
// version yet, and only the workspace's own scenarios.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as shareComparison } from "@/app/api/comparisons/[id]/share/route";
import { POST as createComparison } from "@/app/api/comparisons/route";
import { POST as shareVersion } from "@/app/api/scenarios/[id]/versions/[n]/share/route";
import { POST as decide } from "@/app/api/scenarios/[id]/versions/[n]/signoff/route";
import { getScenarioSignoffSummary, listScenarioSignoffSummaries, signoffState } from "@/server/signoffs/summary";
import { startMailSink } from "../fits/helpers";
import { call, type Json, makeReviewWorkspace, saveNextVersion, scenarioWithVersions, type Workspace } from "./support";

let setup: Workspace;
let other: Workspace;
let mail: Awaited<ReturnType<typeof startMailSink>>;

beforeAll(async () => {
  mail = await startMailSink();
  setup = await makeReviewWorkspace();
  other = await makeReviewWorkspace();
});

afterAll(async () => {
  await mail?.stop();
});

const versionPath = (id: string, n: number, tail: string) => `/api/scenarios/${id}/versions/${n}/${tail}`;
const params = (id: string, n: number) => ({ id, n: String(n) });

async function share(id: string, n: number) {
  const shared = await call(shareVersion, versionPath(id, n, "share"), params(id, n), {
    method: "POST",
    json: { recipients: [setup.members.finance.email], acknowledgement: "Checked." },
    token: setup.members.planner.token,
  });
  expect(shared.status, JSON.stringify(shared.body)).toBe(201);
}

async function decideOn(id: string, n: number, json: Json) {
  const decided = await call(decide, versionPath(id, n, "signoff"), params(id, n), { method: "POST", json, token: setup.members.finance.token });
  expect(decided.status, JSON.stringify(decided.body)).toBe(201);
}

const summaryOf = async (id: string) => {
  const summary = await getScenarioSignoffSummary(setup.workspace.id, id);
  if (!summary) throw new Error("no summary");
  return summary;
};

describe("scenario sign-off summary", () => {
  it("follows the latest version: not shared, awaiting, signed off; a newer version names the earlier sign-off; a decline keeps its reason", async () => {
    const scenario = await scenarioWithVersions(setup, "Summary plan", [0, 13_000]);
    expect(await summaryOf(scenario.id)).toMatchObject({ latestVersion: 2, state: "not_shared", latestDecision: null, earlierSignedOff: null });

    await share(scenario.id, 2);
    expect((await summaryOf(scenario.id)).state).toBe("awaiting");

    await decideOn(scenario.id, 2, { decision: "signed_off" });
    const signed = await summaryOf(scenario.id);
    expect(signed).toMatchObject({ latestVersion: 2, state: "signed_off", earlierSignedOff: null });
    expect(signed.latestDecision).toMatchObject({ version: 2, decision: "signed_off", decidedByName: setup.members.finance.name });

    await saveNextVersion(setup, scenario, 19_500);
    const newer = await summaryOf(scenario.id);
    expect(newer).toMatchObject({ latestVersion: 3, state: "not_shared", latestDecision: null });
    expect(newer.earlierSignedOff).toMatchObject({ version: 2, decision: "signed_off" });

    await share(scenario.id, 3);
    await decideOn(scenario.id, 3, { decision: "declined", reason: "Too much on search." });
    const declined = await summaryOf(scenario.id);
    expect(declined).toMatchObject({ latestVersion: 3, state: "declined" });
    expect(declined.latestDecision).toMatchObject({ decision: "declined", reason: "Too much on search." });
    expect(declined.earlierSignedOff).toMatchObject({ version: 2 });

    // A later decision on version 2 replaces its sign-off: nothing earlier is signed off any more.
    await decideOn(scenario.id, 2, { decision: "declined", reason: "Changed our mind." });
    expect((await summaryOf(scenario.id)).earlierSignedOff).toBeNull();
  });

  it("counts a version shared inside a comparison as awaiting; no version yet is its own state", async () => {
    const a = await scenarioWithVersions(setup, "Summary in a comparison", [0]);
    const b = await scenarioWithVersions(setup, "Summary partner", [0]);
    const empty = await scenarioWithVersions(setup, "Summary without versions", []);
    const created = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Summary comparison", versions: [{ scenarioId: a.id, version: 1 }, { scenarioId: b.id, version: 1 }] },
      token: setup.members.planner.token,
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect((await summaryOf(a.id)).state).toBe("not_shared");
    const shared = await call(shareComparison, `/api/comparisons/${created.body.id}/share`, { id: created.body.id }, {
      method: "POST",
      json: { recipients: [setup.members.finance.email], acknowledgement: "Checked." },
      token: setup.members.planner.token,
    });
    expect(shared.status, JSON.stringify(shared.body)).toBe(201);
    const all = await listScenarioSignoffSummaries(setup.workspace.id);
    expect(all.get(a.id)?.state).toBe("awaiting");
    expect(all.get(b.id)?.state).toBe("awaiting");
    expect(all.get(empty.id)).toMatchObject({ latestVersion: null, state: "no_version", latestDecision: null, earlierSignedOff: null });
  });

  it("lists only the workspace's own scenarios", async () => {
    const mine = await scenarioWithVersions(setup, "Summary scoping", [0]);
    expect((await listScenarioSignoffSummaries(other.workspace.id)).has(mine.id)).toBe(false);
    expect(await getScenarioSignoffSummary(other.workspace.id, mine.id)).toBeNull();
  });

  it("derives the state from the latest decision, else from sharing", () => {
    expect(signoffState({ latestVersion: null, latestDecision: null, shared: false })).toBe("no_version");
    expect(signoffState({ latestVersion: 1, latestDecision: null, shared: false })).toBe("not_shared");
    expect(signoffState({ latestVersion: 1, latestDecision: null, shared: true })).toBe("awaiting");
    expect(signoffState({ latestVersion: 1, latestDecision: { decision: "declined" }, shared: true })).toBe("declined");
    expect(signoffState({ latestVersion: 1, latestDecision: { decision: "signed_off" }, shared: false })).toBe("signed_off");
  });
});
