// The review workflow through the API (states, refusals, separation of duties, audit entries,
// e-mails) and the freeze: an approved fit and its data cannot change, through the API or by SQL.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getFit, PUT as refitFit } from "@/app/api/fits/[id]/route";
import { POST as retireFit } from "@/app/api/fits/[id]/retire/route";
import { POST as reviewFit } from "@/app/api/fits/[id]/review/route";
import { POST as submitFit } from "@/app/api/fits/[id]/submit/route";
import { POST as createFit } from "@/app/api/fits/route";
import { assignDatasetRoles, deleteDataset } from "@/server/datasets/store";
import { plainTextOf } from "@/server/mail/outbox";
import { apiRequest, demoRequest, demoRoles, makeTeam, routeContext, sql, startMailSink, subjectOf, uploadDemoDataset } from "./helpers";

let mail: Awaited<ReturnType<typeof startMailSink>>;
beforeAll(async () => {
  mail = await startMailSink();
});
afterAll(async () => {
  await mail?.stop();
});

const call = (handler: typeof submitFit, path: string, id: string, token: string, json?: unknown) =>
  handler(apiRequest(path, { method: "POST", token, json: json ?? {} }), routeContext({ id }));
const submit = (id: string, token: string) => call(submitFit, `/api/fits/${id}/submit`, id, token);
const review = (id: string, token: string, json: unknown) => call(reviewFit, `/api/fits/${id}/review`, id, token, json);
const retire = (id: string, token: string, json?: unknown) => call(retireFit, `/api/fits/${id}/retire`, id, token, json);

async function draftFit(team: Awaited<ReturnType<typeof makeTeam>>, authorToken: string, authorId: string) {
  const datasetId = await uploadDemoDataset(team.workspace.id, authorId);
  const response = await createFit(apiRequest("/api/fits", { method: "POST", token: authorToken, json: demoRequest(datasetId, { name: "Sales on six channels" }) }), routeContext());
  expect(response.status).toBe(201);
  return { fit: (await response.json()) as { id: string; recordChecksum: string; report?: unknown }, datasetId };
}

async function expectError(response: Response, status: number, message: RegExp) {
  expect(response.status).toBe(status);
  const body = await response.json();
  expect(body.error).toMatch(message);
  expect(Array.isArray(body.details)).toBe(true);
}

describe("review workflow", () => {
  it("moves draft → in review → changes requested → in review → approved → retired, with audit entries and e-mails", async () => {
    const team = await makeTeam({ analyst: ["analyst"], other: ["analyst"], reviewer: ["reviewer"], planner: ["planner"] });
    const { tokens, members } = team;
    const { fit } = await draftFit(team, tokens.analyst, members.analyst.id);
    const since = mail.messages.length;

    // Only the author sends a draft for review; planners may not at all.
    await expectError(await submit(fit.id, tokens.other), 403, /Only the analyst who built this fit/);
    await expectError(await submit(fit.id, tokens.planner), 403, /needs the analyst role/);
    const submitted = await submit(fit.id, tokens.analyst);
    expect(submitted.status).toBe(200);
    expect((await submitted.json()).status).toBe("in_review");
    await expectError(await submit(fit.id, tokens.analyst), 409, /This fit is in review/);
    const toReviewers = await mail.waitFor((m) => subjectOf(m) === "Fit to review: Sales on six channels");
    expect(toReviewers.to).toEqual([members.reviewer.email]);
    expect(plainTextOf(toReviewers.raw)).toContain(`/fits/${fit.id}`);

    // Analysts cannot review; a request for changes needs a comment.
    await expectError(await review(fit.id, tokens.other, { decision: "approve" }), 403, /needs the reviewer role/);
    await expectError(await review(fit.id, tokens.reviewer, { decision: "request-changes" }), 422, /not valid/);
    await expectError(await review(fit.id, tokens.reviewer, { decision: "request-changes", comment: "   " }), 422, /not valid/);
    const changes = await review(fit.id, tokens.reviewer, { decision: "request-changes", comment: "Try log(1 + x) on search." });
    expect(changes.status).toBe(200);
    expect((await changes.json()).status).toBe("changes_requested");
    const toAuthor = await mail.waitFor((m) => subjectOf(m) === "Changes requested on fit: Sales on six channels");
    expect(toAuthor.to).toEqual([members.analyst.email]);
    expect(plainTextOf(toAuthor.raw)).toContain("Try log(1 + x) on search.");
    await expectError(await review(fit.id, tokens.reviewer, { decision: "approve" }), 409, /only a fit in review can be approved/);

    // The author refits the draft and sends it again; the reviewer approves.
    const refit = await refitFit(
      apiRequest(`/api/fits/${fit.id}`, { method: "PUT", token: tokens.analyst, json: demoRequest((await (await getFit(apiRequest(`/api/fits/${fit.id}`, { token: tokens.analyst }), routeContext({ id: fit.id }))).json()).datasetId, { name: "Sales on six channels", level: 0.9 }) }),
      routeContext({ id: fit.id }),
    );
    expect(refit.status).toBe(200);
    expect((await refit.json()).level).toBe(0.9);
    expect((await submit(fit.id, tokens.analyst)).status).toBe(200);
    const approved = await review(fit.id, tokens.reviewer, { decision: "approve", comment: "Looks right." });
    expect(approved.status).toBe(200);
    const approvedBody = await approved.json();
    expect(approvedBody).toMatchObject({ status: "approved", approvedBy: members.reviewer.id });
    expect(approvedBody.approvedAt).toBeTruthy();
    const approvalMail = await mail.waitFor((m) => subjectOf(m) === "Fit approved: Sales on six channels");
    expect(approvalMail.to).toEqual([members.analyst.email]);

    // Analysts and reviewers may retire; a retired fit cannot be retired again.
    await expectError(await retire(fit.id, tokens.planner), 403, /analyst or reviewer/);
    const retired = await retire(fit.id, tokens.other, { comment: "Superseded." });
    expect(retired.status).toBe(200);
    expect((await retired.json()).status).toBe("retired");
    await expectError(await retire(fit.id, tokens.reviewer), 409, /already retired/);
    await mail.waitFor((m) => subjectOf(m) === "Fit retired: Sales on six channels" && m.to.includes(members.analyst.email) && m.to.includes(members.reviewer.email));
    expect(mail.messages.length - since).toBe(5);

    // The trail: every transition with who, from, to and the comment, oldest first.
    const trail = (await (await getFit(apiRequest(`/api/fits/${fit.id}`, { token: tokens.planner }), routeContext({ id: fit.id }))).json()).trail;
    expect(trail.map((e: Record<string, unknown>) => [e.action, e.from, e.to, e.actorEmail, e.comment])).toEqual([
      ["fit.created", null, "draft", members.analyst.email, null],
      ["fit.submitted", "draft", "in_review", members.analyst.email, null],
      ["fit.changes_requested", "in_review", "changes_requested", members.reviewer.email, "Try log(1 + x) on search."],
      ["fit.refitted", "changes_requested", "changes_requested", members.analyst.email, null],
      ["fit.submitted", "changes_requested", "in_review", members.analyst.email, null],
      ["fit.approved", "in_review", "approved", members.reviewer.email, "Looks right."],
      ["fit.retired", "approved", "retired", members.other.email, "Superseded."],
    ]);
    const [audit] = await sql()<{ n: number }[]>`select count(*)::int as n from audit_log where object_type = 'fit' and object_id = ${fit.id}`;
    expect(audit.n).toBe(7);
  });

  it("never lets the author approve their own fit, whatever roles they hold", async () => {
    const team = await makeTeam({ both: ["analyst", "reviewer"], reviewer: ["reviewer"] });
    const { fit } = await draftFit(team, team.tokens.both, team.members.both.id);
    expect((await submit(fit.id, team.tokens.both)).status).toBe(200);
    await expectError(await review(fit.id, team.tokens.both, { decision: "approve" }), 403, /You built this fit, so someone else must approve it/);
    // The database says no as well: approved_by may never be the author.
    await expect(sql()`update fits set status = 'approved', approved_at = now(), approved_by = author_id where id = ${fit.id}`).rejects.toThrow(
      /fits_not_self_approved_check/,
    );
    expect((await review(fit.id, team.tokens.reviewer, { decision: "approve" })).status).toBe(200);
  });

  it("hides other workspaces' fits (404) from every route", async () => {
    const ours = await makeTeam({ analyst: ["analyst"], reviewer: ["reviewer"] });
    const theirs = await makeTeam({ owner: ["analyst", "reviewer"] });
    const { fit } = await draftFit(ours, ours.tokens.analyst, ours.members.analyst.id);
    const other = theirs.tokens.owner;
    expect((await getFit(apiRequest(`/api/fits/${fit.id}`, { token: other }), routeContext({ id: fit.id }))).status).toBe(404);
    expect((await submit(fit.id, other)).status).toBe(404);
    expect((await review(fit.id, other, { decision: "approve" })).status).toBe(404);
    expect((await retire(fit.id, other)).status).toBe(404);
    const refit = await refitFit(apiRequest(`/api/fits/${fit.id}`, { method: "PUT", token: other, json: demoRequest(fit.id) }), routeContext({ id: fit.id }));
    expect(refit.status).toBe(404);
  });
});

describe("an approved fit is frozen", () => {
  async function approvedFit() {
    const team = await makeTeam({ analyst: ["analyst"], reviewer: ["reviewer"] });
    const { fit, datasetId } = await draftFit(team, team.tokens.analyst, team.members.analyst.id);
    expect((await submit(fit.id, team.tokens.analyst)).status).toBe(200);
    expect((await review(fit.id, team.tokens.reviewer, { decision: "approve" })).status).toBe(200);
    return { team, fit, datasetId };
  }

  it("refuses changes through the API with a clear 409", async () => {
    const { team, fit, datasetId } = await approvedFit();
    const refit = await refitFit(
      apiRequest(`/api/fits/${fit.id}`, { method: "PUT", token: team.tokens.analyst, json: demoRequest(datasetId, { level: 0.8 }) }),
      routeContext({ id: fit.id }),
    );
    await expectError(refit, 409, /Only a draft, or a fit with changes requested, can be refitted/);
    await expectError(await submit(fit.id, team.tokens.analyst), 409, /This fit is approved/);
    await expectError(await review(fit.id, team.tokens.reviewer, { decision: "request-changes", comment: "reopen" }), 409, /This fit is approved/);
    const after = await (await getFit(apiRequest(`/api/fits/${fit.id}`, { token: team.tokens.analyst }), routeContext({ id: fit.id }))).json();
    expect(after.level).toBe(0.95);
    expect(after.recordChecksum).toBe(fit.recordChecksum);
  });

  it("refuses a direct SQL UPDATE or DELETE of its numbers (trigger)", async () => {
    const { fit } = await approvedFit();
    const db = sql();
    const frozen = /fit .* is approved: its numbers and data are frozen/;
    await expect(db`update fits set report = '{}'::jsonb where id = ${fit.id}`).rejects.toThrow(frozen);
    await expect(db`update fits set record = jsonb_set(record, '{coefficients,1}', '0') where id = ${fit.id}`).rejects.toThrow(frozen);
    await expect(db`update fits set confidence_level = 0.5 where id = ${fit.id}`).rejects.toThrow(/refused change to confidence_level/);
    await expect(db`update fits set specification = '{}'::jsonb, covariance_type = 'hc3' where id = ${fit.id}`).rejects.toThrow(/refused change to covariance_type, specification/);
    await expect(db`update fits set status = 'draft' where id = ${fit.id}`).rejects.toThrow(/it can only move to retired/);
    await expect(db`delete from fits where id = ${fit.id}`).rejects.toThrow(/approved and retired fits cannot be deleted/);
    const error = await db`update fits set report = '{}'::jsonb where id = ${fit.id}`.catch((e: { code?: string }) => e);
    expect(error).toMatchObject({ code: "23001" });
    const [row] = await db<{ checksum: string; status: string }[]>`select record_checksum as checksum, status from fits where id = ${fit.id}`;
    expect(row).toEqual({ checksum: fit.recordChecksum, status: "approved" });

    // Retiring is the one change allowed, and after it nothing changes at all.
    await db`update fits set status = 'retired', retired_at = now() where id = ${fit.id}`;
    await expect(db`update fits set name = 'renamed' where id = ${fit.id}`).rejects.toThrow(/a retired fit cannot be changed/);
    await expect(db`delete from fits where id = ${fit.id}`).rejects.toThrow(/cannot be deleted/);
  });

  it("freezes the data it was fitted on: rows, columns and file, by SQL and through the datasets engine", async () => {
    const { team, fit, datasetId } = await approvedFit();
    const db = sql();
    const frozen = new RegExp(`dataset ${datasetId} is used by approved fit ${fit.id}`);
    await expect(db`update dataset_rows set numbers[2] = 0 where dataset_id = ${datasetId} and row_number = 1`).rejects.toThrow(frozen);
    await expect(db`delete from dataset_rows where dataset_id = ${datasetId}`).rejects.toThrow(frozen);
    await expect(db`update dataset_columns set unit = 'USD' where dataset_id = ${datasetId}`).rejects.toThrow(frozen);
    await expect(db`delete from dataset_files where dataset_id = ${datasetId}`).rejects.toThrow(frozen);
    await expect(db`update datasets set name = 'renamed' where id = ${datasetId}`).rejects.toThrow(frozen);
    await expect(db`delete from datasets where id = ${datasetId}`).rejects.toThrow(frozen);
    await expect(deleteDataset({ workspaceId: team.workspace.id, datasetId })).rejects.toThrow(frozen);
    const roles = { ...demoRoles(), display_eur: { role: "ignored" as never } };
    await expect(assignDatasetRoles({ workspaceId: team.workspace.id, datasetId, userId: team.members.analyst.id, roles })).rejects.toThrow(frozen);
    const [count] = await db<{ n: number }[]>`select count(*)::int as n from dataset_rows where dataset_id = ${datasetId}`;
    expect(count.n).toBe(156);

    // A dataset used only by drafts stays editable, and deleting it takes the drafts with it.
    const draft = await draftFit(team, team.tokens.analyst, team.members.analyst.id);
    expect(await deleteDataset({ workspaceId: team.workspace.id, datasetId: draft.datasetId })).toBe(true);
    const [gone] = await db<{ n: number }[]>`select count(*)::int as n from fits where id = ${draft.fit.id}`;
    expect(gone.n).toBe(0);
  });
});
