// Finance review against real PostgreSQL: sign-offs bound to one version (a later version is not
// signed off), declines need a reason, sharing with finance members (e-mail, notification; warned
// versions need an acknowledgement), comments with threaded replies and @mentions that e-mail the
// member, notifications read/unread, the audit trail, roles (finance cannot save a version: 403)
// and workspace scoping (404).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as shareComparison } from "@/app/api/comparisons/[id]/share/route";
import { GET as getComparison } from "@/app/api/comparisons/[id]/route";
import { GET as listComparisons, POST as createComparison } from "@/app/api/comparisons/route";
import { GET as listNotifications } from "@/app/api/notifications/route";
import { POST as markRead } from "@/app/api/notifications/read/route";
import { POST as saveVersion } from "@/app/api/scenarios/[id]/versions/route";
import { GET as listComments, POST as postComment } from "@/app/api/scenarios/[id]/versions/[n]/comments/route";
import { POST as shareVersion } from "@/app/api/scenarios/[id]/versions/[n]/share/route";
import { GET as getSignoff, POST as decide } from "@/app/api/scenarios/[id]/versions/[n]/signoff/route";
import { getDatabase } from "@/db/client";
import { plainTextOf } from "@/server/mail/outbox";
import { amountToCents } from "@/server/planning/allocation";
import { describeAuditEvent } from "@/ui/audit-event";
import { startMailSink } from "../fits/helpers";
import { call, type Json, makeReviewWorkspace, movedPlan, saveNextVersion, scenarioWithVersions, type Workspace } from "./support";

let setup: Workspace;
let other: Workspace;
let mail: Awaited<ReturnType<typeof startMailSink>>;
let scenario: Awaited<ReturnType<typeof scenarioWithVersions>>;

beforeAll(async () => {
  mail = await startMailSink();
  setup = await makeReviewWorkspace();
  other = await makeReviewWorkspace();
  scenario = await scenarioWithVersions(setup, "Autumn plan", [0, 13_000]);
});

afterAll(async () => {
  await mail?.stop();
});

const versionPath = (id: string, n: number, tail: string) => `/api/scenarios/${id}/versions/${n}/${tail}`;
const params = (id: string, n: number) => ({ id, n: String(n) });

function signoff(id: string, n: number, json: Json, token = setup.members.finance.token) {
  return call(decide, versionPath(id, n, "signoff"), params(id, n), { method: "POST", json, token });
}

async function auditRows(objectId: string) {
  const { sql } = getDatabase();
  return sql<{ action: string; actor_user_id: string; at: Date; details: Json }[]>`
    select action, actor_user_id, at, details from audit_log where object_id = ${objectId} order by id`;
}

/** A plan with podcast spend beyond anything in the history (an "outside-range" warning). */
function warnedPlan(baseline: Json, maximumPerWeek: number) {
  const allocation = { ...baseline.allocation, podcast_eur: (maximumPerWeek + 2_000) * baseline.horizon };
  const total = Object.values(allocation as Record<string, number>).reduce((sum, value) => sum + amountToCents(value), 0) / 100;
  return { mode: "fixed", allocation, total, horizon: baseline.horizon, controls: baseline.controls };
}

describe("sign-off", () => {
  it("is bound to one version: signing off v2 leaves v1 and a later v3 not signed off", async () => {
    const decided = await signoff(scenario.id, 2, { decision: "signed_off", reason: "Within budget." });
    expect(decided.status, JSON.stringify(decided.body)).toBe(201);
    expect(decided.body).toMatchObject({ scenarioId: scenario.id, version: 2, decision: "signed_off", reason: "Within budget.", decidedByName: "Finance" });

    const v2 = await call(getSignoff, versionPath(scenario.id, 2, "signoff"), params(scenario.id, 2), { token: setup.members.planner.token });
    expect(v2.body.current).toMatchObject({ decision: "signed_off", version: 2 });
    const v1 = await call(getSignoff, versionPath(scenario.id, 1, "signoff"), params(scenario.id, 1), { token: setup.members.planner.token });
    expect(v1.body).toMatchObject({ current: null, history: [] });

    await saveNextVersion(setup, scenario, 6_500);
    const v3 = await call(getSignoff, versionPath(scenario.id, 3, "signoff"), params(scenario.id, 3), { token: setup.members.planner.token });
    expect(v3.body).toMatchObject({ version: 3, current: null });

    // The planner is told in the app.
    const inbox = await call(listNotifications, "/api/notifications", {}, { token: setup.members.planner.token });
    expect(inbox.body.notifications.some((n: Json) => n.kind === "signoff" && n.title === "Finance signed off “Autumn plan” version 2." && n.link === `/scenarios/${scenario.id}?version=2#review`)).toBe(true);
  });

  it("refuses a decline without a reason (422), in the schema and in the database", async () => {
    for (const reason of [undefined, "", "   "]) {
      const refused = await signoff(scenario.id, 1, { decision: "declined", reason });
      expect(refused.status).toBe(422);
      expect(refused.body.details).toEqual([expect.objectContaining({ path: "reason" })]);
    }
    const { sql } = getDatabase();
    await expect(
      sql`insert into signoffs (workspace_id, scenario_id, version_number, decision, reason) values (${setup.workspace.id}, ${scenario.id}, 1, 'declined', ' ')`,
    ).rejects.toThrow(/signoffs_reason_check/);
    const declined = await signoff(scenario.id, 1, { decision: "declined", reason: "Too much on display." });
    expect(declined.status).toBe(201);
    expect(declined.body).toMatchObject({ decision: "declined", reason: "Too much on display.", version: 1 });
  });

  it("keeps the history: a later decision on the same version becomes its status", async () => {
    await signoff(scenario.id, 1, { decision: "signed_off" });
    const status = await call(getSignoff, versionPath(scenario.id, 1, "signoff"), params(scenario.id, 1), { token: setup.members.finance.token });
    expect(status.body.current.decision).toBe("signed_off");
    expect(status.body.history.map((entry: Json) => entry.decision)).toEqual(["signed_off", "declined"]);
  });

  it("is for finance only (403 for planners), and another workspace's version is 404", async () => {
    expect((await signoff(scenario.id, 2, { decision: "signed_off" }, setup.members.planner.token)).status).toBe(403);
    expect((await signoff(scenario.id, 2, { decision: "signed_off" }, other.members.finance.token)).status).toBe(404);
    expect((await signoff(scenario.id, 99, { decision: "signed_off" })).status).toBe(404);
  });

  it("is in the audit log with who and when", async () => {
    const rows = await auditRows(scenario.id);
    const decisions = rows.filter((row) => row.action.startsWith("signoff."));
    expect(decisions.map((row) => [row.action, row.details.version, row.details.reason])).toEqual([
      ["signoff.signed_off", 2, "Within budget."],
      ["signoff.declined", 1, "Too much on display."],
      ["signoff.signed_off", 1, null],
    ]);
    expect(decisions.every((row) => row.actor_user_id === setup.members.finance.id && Number.isFinite(new Date(row.at).getTime()))).toBe(true);
  });
});

describe("finance cannot change an allocation", () => {
  it("gets 403 saving a version; the scenario keeps its versions", async () => {
    const saved = await call(saveVersion, `/api/scenarios/${scenario.id}/versions`, { id: scenario.id }, {
      method: "POST",
      json: { baseVersion: scenario.versions.length, ...movedPlan(scenario.baseline, 1_300) },
      token: setup.members.finance.token,
    });
    expect(saved.status).toBe(403);
    const { sql } = getDatabase();
    const [{ count }] = await sql<{ count: number }[]>`select count(*)::int as count from scenario_versions where scenario_id = ${scenario.id}`;
    expect(count).toBe(scenario.versions.length);
  });
});

describe("sharing", () => {
  it("shares a comparison with chosen finance members: e-mail with the link, notification, audit", async () => {
    const created = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Autumn v1 vs v2", versions: [1, 2].map((version) => ({ scenarioId: scenario.id, version })) },
      token: setup.members.planner.token,
    });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const since = mail.messages.length;
    const shared = await call(shareComparison, `/api/comparisons/${id}/share`, { id }, {
      method: "POST",
      json: { recipients: [setup.members.finance.email, setup.members.finance2.id], note: "Please look before Friday." },
      token: setup.members.planner.token,
    });
    expect(shared.status, JSON.stringify(shared.body)).toBe(201);
    expect(shared.body.recipients.map((r: Json) => r.email).sort()).toEqual([setup.members.finance.email, setup.members.finance2.email].sort());
    expect(shared.body.mailedTo.sort()).toEqual([setup.members.finance.email, setup.members.finance2.email].sort());

    const message = await mail.waitFor((m) => m.to.includes(setup.members.finance2.email) && mail.messages.indexOf(m) >= since);
    const text = plainTextOf(message.raw);
    expect(text).toContain("Planner shared the comparison “Autumn v1 vs v2” with you for review.");
    expect(text).toContain("Please look before Friday.");
    expect(text).toMatch(new RegExp(`^https?://[^/\\s]+/compare/${id}$`, "m"));

    const inbox = await call(listNotifications, "/api/notifications", {}, { token: setup.members.finance2.token });
    expect(inbox.body.unread).toBeGreaterThanOrEqual(1);
    const notification = inbox.body.notifications.find((n: Json) => n.kind === "share");
    expect(notification).toMatchObject({ link: `/compare/${id}`, actorName: "Planner", readAt: null });

    const read = await call(markRead, "/api/notifications/read", {}, { method: "POST", json: { ids: [notification.id] }, token: setup.members.finance2.token });
    expect(read.body).toMatchObject({ marked: 1, unread: inbox.body.unread - 1 });
    // Someone else's ids are ignored.
    const foreign = await call(markRead, "/api/notifications/read", {}, { method: "POST", json: { ids: [notification.id] }, token: setup.members.finance.token });
    expect(foreign.body.marked).toBe(0);

    const audit = (await auditRows(id)).find((row) => row.action === "share.created");
    expect(audit?.actor_user_id).toBe(setup.members.planner.id);
    expect(audit?.details.recipients.sort()).toEqual([setup.members.finance.email, setup.members.finance2.email].sort());
    // The activity list names the people (older entries without names fall back to the addresses).
    const phrase = describeAuditEvent({ action: "share.created", objectType: "comparison", details: audit!.details });
    expect(phrase).toMatch(/^shared the comparison “Autumn v1 vs v2” with /);
    for (const member of [setup.members.finance, setup.members.finance2]) expect(phrase).toContain(member.name);
    expect(phrase).not.toContain(setup.members.finance.email);
    const { recipientNames: _names, ...older } = audit!.details;
    expect(describeAuditEvent({ action: "share.created", objectType: "comparison", details: older })).toContain(setup.members.finance2.email);

    // Finance opens it read-only.
    const opened = await call(getComparison, `/api/comparisons/${id}`, { id }, { token: setup.members.finance2.token });
    expect(opened.status).toBe(200);
    expect(opened.body.columns.map((c: Json) => [c.version, c.signoff?.decision ?? null])).toEqual([
      [1, "signed_off"],
      [2, "signed_off"],
    ]);
    const listed = await call(listComparisons, "/api/comparisons", {}, { token: setup.members.finance.token });
    expect(listed.body.comparisons.some((c: Json) => c.id === id)).toBe(true);
  });

  it("only with finance members of the workspace (422), and only by planners (403)", async () => {
    const shareV1 = (json: Json, token = setup.members.planner.token) =>
      call(shareVersion, versionPath(scenario.id, 1, "share"), params(scenario.id, 1), { method: "POST", json, token });
    const notFinance = await shareV1({ recipients: [setup.members.reviewer.email] });
    expect(notFinance.status).toBe(422);
    expect(notFinance.body.details[0]).toMatchObject({ path: "recipients.0" });
    const stranger = await shareV1({ recipients: [other.members.finance.email] });
    expect(stranger.status).toBe(422);
    expect((await shareV1({ recipients: [] })).status).toBe(422);
    expect((await shareV1({ recipients: [setup.members.finance.email] }, setup.members.finance.token)).status).toBe(403);
    expect((await shareV1({ recipients: [other.members.finance.email] }, other.members.planner.token)).status).toBe(404);
  });

  it("of a version with warnings requires an acknowledgement (422 without it)", async () => {
    const podcastMaximum = setup.fit.record.columnRanges.podcast_eur.maximum;
    const saved = await call(saveVersion, `/api/scenarios/${scenario.id}/versions`, { id: scenario.id }, {
      method: "POST",
      json: { baseVersion: scenario.versions.length, note: "Podcast push", ...warnedPlan(scenario.baseline, podcastMaximum) },
      token: setup.members.planner.token,
    });
    expect(saved.status).toBe(201);
    expect(saved.body.warnings.length).toBeGreaterThan(0);
    scenario.versions.push(saved.body);
    const n = saved.body.number as number;
    const share = (json: Json) => call(shareVersion, versionPath(scenario.id, n, "share"), params(scenario.id, n), { method: "POST", json, token: setup.members.planner.token });

    for (const acknowledgement of [undefined, null, "  "]) {
      const refused = await share({ recipients: [setup.members.finance.email], acknowledgement });
      expect(refused.status).toBe(422);
      expect(refused.body.details).toEqual([expect.objectContaining({ path: "acknowledgement" })]);
      expect(refused.body.error).toMatch(/Podcast beyond observed range/);
    }
    const accepted = await share({ recipients: [setup.members.finance.email], acknowledgement: "Podcast is a test we accept; the number is a guess." });
    expect(accepted.status).toBe(201);
    expect(accepted.body.acknowledgement).toBe("Podcast is a test we accept; the number is a guess.");
    const message = await mail.waitFor((m) => plainTextOf(m.raw).includes(`version ${n} with you`));
    expect(plainTextOf(message.raw)).toContain("acknowledged them: “Podcast is a test we accept; the number is a guess.”");
    const { sql } = getDatabase();
    const [row] = await sql<{ acknowledgement: string }[]>`select acknowledgement from shares where id = ${accepted.body.id}`;
    expect(row.acknowledgement).toBe("Podcast is a test we accept; the number is a guess.");

    // A comparison that includes the warned version needs it too.
    const created = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "With the podcast push", versions: [2, n].map((version) => ({ scenarioId: scenario.id, version })) },
      token: setup.members.planner.token,
    });
    const id = created.body.id as string;
    const refused = await call(shareComparison, `/api/comparisons/${id}/share`, { id }, { method: "POST", json: { recipients: [setup.members.finance.email] }, token: setup.members.planner.token });
    expect(refused.status).toBe(422);
    expect(refused.body.details[0].path).toBe("acknowledgement");
  });
});

describe("comments", () => {
  it("thread on a version; @mentions e-mail the member; replies stay on the version", async () => {
    const post = (n: number, json: Json, token = setup.members.finance.token) =>
      call(postComment, versionPath(scenario.id, n, "comments"), params(scenario.id, n), { method: "POST", json, token });
    const since = mail.messages.length;
    const first = await post(2, { body: "Why does display drop so much? @Planner please explain; cc @" + setup.members.finance2.email });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect(first.body.mentions.map((m: Json) => m.email).sort()).toEqual([setup.members.planner.email, setup.members.finance2.email].sort());

    const toPlanner = await mail.waitFor((m) => m.to.includes(setup.members.planner.email) && mail.messages.indexOf(m) >= since);
    const text = plainTextOf(toPlanner.raw);
    expect(text).toContain("Finance mentioned you in a comment on “Autumn plan” version 2.");
    expect(text).toContain("> Why does display drop so much?");
    expect(text).toContain(`/scenarios/${scenario.id}?version=2#review`);
    await mail.waitFor((m) => m.to.includes(setup.members.finance2.email) && mail.messages.indexOf(m) >= since);

    const reply = await post(2, { body: "Display had diminishing returns last quarter.", parentId: first.body.id }, setup.members.planner.token);
    expect(reply.status).toBe(201);
    expect(reply.body.parentId).toBe(first.body.id);
    // A reply must stay on the parent's version.
    const elsewhere = await post(1, { body: "Wrong place", parentId: first.body.id });
    expect(elsewhere.status).toBe(422);
    expect(elsewhere.body.details[0].path).toBe("parentId");

    const thread = await call(listComments, versionPath(scenario.id, 2, "comments"), params(scenario.id, 2), { token: setup.members.reviewer.token });
    expect(thread.body.comments.map((c: Json) => [c.authorName, c.parentId === null ? "top" : "reply"])).toEqual([
      ["Finance", "top"],
      ["Planner", "reply"],
    ]);
    const v1 = await call(listComments, versionPath(scenario.id, 1, "comments"), params(scenario.id, 1), { token: setup.members.reviewer.token });
    expect(v1.body.comments).toEqual([]);

    // The finance member who was replied to is told in the app.
    const inbox = await call(listNotifications, "/api/notifications?unread=1", {}, { token: setup.members.finance.token });
    expect(inbox.body.notifications.some((n: Json) => n.kind === "reply")).toBe(true);

    const audit = (await auditRows(scenario.id)).filter((row) => row.action.startsWith("comment."));
    expect(audit.map((row) => [row.action, row.details.version, row.actor_user_id])).toEqual([
      ["comment.posted", 2, setup.members.finance.id],
      ["comment.replied", 2, setup.members.planner.id],
    ]);
  });

  it("needs comment:write (reviewers read only: 403) and the workspace (404)", async () => {
    const post = (token: string) => call(postComment, versionPath(scenario.id, 1, "comments"), params(scenario.id, 1), { method: "POST", json: { body: "Hello" }, token });
    expect((await post(setup.members.reviewer.token)).status).toBe(403);
    expect((await post(other.members.finance.token)).status).toBe(404);
    expect((await post(setup.members.planner.token)).status).toBe(201);
  });
});

describe("comparisons", () => {
  it("are opened only inside their workspace (404 elsewhere) and need 2–4 distinct versions", async () => {
    const created = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Scoped", versions: [1, 2].map((version) => ({ scenarioId: scenario.id, version })) },
      token: setup.members.finance.token,
    });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    expect((await call(getComparison, `/api/comparisons/${id}`, { id }, { token: other.members.finance.token })).status).toBe(404);
    const same = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Twice", versions: [1, 1].map((version) => ({ scenarioId: scenario.id, version })) },
      token: setup.members.planner.token,
    });
    expect(same.status).toBe(422);
    const one = await call(createComparison, "/api/comparisons", {}, { method: "POST", json: { name: "One", versions: [{ scenarioId: scenario.id, version: 1 }] }, token: setup.members.planner.token });
    expect(one.status).toBe(422);
    const foreign = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Foreign", versions: [1, 2].map((version) => ({ scenarioId: scenario.id, version })) },
      token: other.members.planner.token,
    });
    expect(foreign.status).toBe(404);
    const reviewer = await call(createComparison, "/api/comparisons", {}, {
      method: "POST",
      json: { name: "Reviewer", versions: [1, 2].map((version) => ({ scenarioId: scenario.id, version })) },
      token: setup.members.reviewer.token,
    });
    expect(reviewer.status).toBe(403);
  });
});
