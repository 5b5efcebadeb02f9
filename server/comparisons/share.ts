import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "@/db/client";
import { comparisonVersions, comparisons, scenarios, shareRecipients, shares, users } from "@/db/schema";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { recordAudit } from "@/server/data/audit";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { normalizeEmail } from "@/server/data/users";
import { AppError, type ErrorDetail } from "@/server/errors";
import { sendReviewMails } from "@/server/notifications/mail";
import { createNotifications } from "@/server/notifications/store";
import type { ScenarioWarning } from "@/server/predict/scenario-outcome";
import { getComparisonRecord } from "./store";
import type { SharedWithMeDto } from "./types";
import { comparisonPath, requireVersion, versionReviewPath, versionTitle } from "./versions";

export type ShareInput = {
  /** Finance members of the workspace, by user id or e-mail address. */
  recipients: string[];
  note?: string;
  /** Required when a shared version carries extrapolation warnings. */
  acknowledgement?: string | null;
};

export type ShareDto = {
  id: string;
  objectType: "scenario" | "comparison";
  link: string;
  recipients: { userId: string; name: string | null; email: string }[];
  note: string;
  acknowledgement: string | null;
  createdAt: string;
  /** Addresses the e-mail went to. */
  mailedTo: string[];
};

type Recipient = { userId: string; name: string | null; email: string };

export type ShareOptions = {
  /**
   * Whether each recipient gets an e-mail (default true). The demo seed records its share and the
   * notification without one: it runs before the mail sink is up, and nobody reads a script's mail.
   */
  mail?: boolean;
};

/** The chosen people, each a finance member of the workspace (422 naming each one who is not). */
export async function resolveFinanceRecipients(workspaceId: string, chosen: string[]): Promise<Recipient[]> {
  const members = await listMembersByWorkspaceId(workspaceId);
  const details: ErrorDetail[] = [];
  const result = new Map<string, Recipient>();
  chosen.forEach((value, index) => {
    const key = value.trim();
    const member = key.includes("@") ? members.find((m) => m.email === normalizeEmail(key)) : members.find((m) => m.userId === key);
    if (!member) details.push({ path: `recipients.${index}`, message: `${key} is not a member of this workspace.` });
    else if (!member.roles.includes("finance")) details.push({ path: `recipients.${index}`, message: `${member.name ?? member.email} is not a finance member; share with finance members.` });
    else result.set(member.userId, { userId: member.userId, name: member.name, email: member.email });
  });
  if (chosen.length === 0) details.push({ path: "recipients", message: "Choose at least one finance member to share with." });
  if (details.length > 0) throw new AppError("invalid:share", details[0].message, { details });
  return [...result.values()];
}

function warningSummary(warnings: ScenarioWarning[]): string {
  return [...new Set(warnings.map((warning) => (warning.kind === "outside-range" ? `${warning.label} beyond observed range` : "unseen combination")))].join(", ");
}

/** 422 when a warned version is shared without an acknowledgement; the acknowledgement otherwise (null when nothing is warned). */
function requireAcknowledgement(warned: { title: string; warnings: ScenarioWarning[] }[], acknowledgement: string | null | undefined): string | null {
  const text = (acknowledgement ?? "").trim();
  if (warned.length === 0) return text === "" ? null : text;
  if (text === "") {
    const which = warned.map((item) => `${item.title} (${warningSummary(item.warnings)})`).join("; ");
    throw new AppError("invalid:acknowledgement", `${which}: the model has no data there. Write an acknowledgement of the warnings to share.`, {
      details: [{ path: "acknowledgement", message: "Required: a shared version carries extrapolation warnings.", versions: warned.map((item) => item.title) }],
    });
  }
  return text;
}

async function storeShare(
  actor: Actor,
  input: {
    objectType: "scenario" | "comparison";
    objectId: string;
    scenarioId: string | null;
    versionNumber: number | null;
    comparisonId: string | null;
    title: string;
    link: string;
    recipients: Recipient[];
    note: string;
    acknowledgement: string | null;
    auditDetails: Record<string, unknown>;
  },
  options: ShareOptions = {},
): Promise<ShareDto> {
  const who = actor.name ?? actor.email;
  const { id, createdAt } = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(shares)
      .values({
        workspaceId: actor.workspaceId,
        objectType: input.objectType,
        scenarioId: input.scenarioId,
        versionNumber: input.versionNumber,
        comparisonId: input.comparisonId,
        note: input.note,
        acknowledgement: input.acknowledgement,
        sharedBy: actor.userId,
      })
      .returning({ id: shares.id, createdAt: shares.createdAt });
    await tx.insert(shareRecipients).values(input.recipients.map((recipient) => ({ shareId: row.id, userId: recipient.userId })));
    await recordAudit(
      {
        workspaceId: actor.workspaceId,
        actorUserId: actor.userId,
        action: "share.created",
        objectType: input.objectType,
        objectId: input.objectId,
        details: {
          ...input.auditDetails,
          shareId: row.id,
          recipients: input.recipients.map((r) => r.email),
          // Names as they were when shared, for the activity list; the addresses stay the record.
          recipientNames: input.recipients.map((r) => r.name ?? r.email),
          acknowledgement: input.acknowledgement,
          note: input.note || null,
        },
      },
      tx,
    );
    await createNotifications(
      input.recipients
        .filter((recipient) => recipient.userId !== actor.userId)
        .map((recipient) => ({ workspaceId: actor.workspaceId, userId: recipient.userId, kind: "share" as const, title: `${who} shared ${input.title} with you.`, link: input.link, actorId: actor.userId })),
      tx,
    );
    return row;
  });
  const mails = options.mail === false ? [] : input.recipients;
  const mailedTo = await sendReviewMails(
    mails.map((recipient) => ({
      to: recipient.email,
      subject: `${who} shared ${input.title} with you`,
      headline: `${who} shared ${input.title} with you for review.`,
      quote: input.note || null,
      extra: input.acknowledgement ? [`It carries extrapolation warnings; ${who} acknowledged them: “${input.acknowledgement}”`] : [],
      path: input.link,
      linkLabel: input.objectType === "comparison" ? "Open the comparison" : "Open the version",
      workspaceName: actor.workspaceName,
    })),
    "shares",
  );
  return {
    id,
    objectType: input.objectType,
    link: input.link,
    recipients: input.recipients,
    note: input.note,
    acknowledgement: input.acknowledgement,
    createdAt: createdAt.toISOString(),
    mailedTo,
  };
}

/** Shares one scenario version with finance members (e-mail + notification each; audit entry). */
export async function shareScenarioVersion(actor: Actor, input: ShareInput & { scenarioId: string; version: number }): Promise<ShareDto> {
  const { head, version } = await requireVersion(actor, input.scenarioId, input.version);
  const recipients = await resolveFinanceRecipients(actor.workspaceId, input.recipients);
  const title = versionTitle(head.name, version.number);
  const acknowledgement = requireAcknowledgement(version.warnings.length > 0 ? [{ title, warnings: version.warnings }] : [], input.acknowledgement);
  return storeShare(actor, {
    objectType: "scenario",
    objectId: head.id,
    scenarioId: head.id,
    versionNumber: version.number,
    comparisonId: null,
    title,
    link: versionReviewPath(head.id, version.number),
    recipients,
    note: (input.note ?? "").trim(),
    acknowledgement,
    auditDetails: { version: version.number, name: head.name, warnings: version.warnings.map((w) => w.kind) },
  });
}

/** Shares a saved comparison (all its versions) with finance members; any warned version needs the acknowledgement. */
export async function shareComparison(actor: Actor, input: ShareInput & { comparisonId: string }, options: ShareOptions = {}): Promise<ShareDto> {
  const record = await getComparisonRecord(input.comparisonId);
  assertInWorkspace(actor, record, "comparison");
  const recipients = await resolveFinanceRecipients(actor.workspaceId, input.recipients);
  const warned: { title: string; warnings: ScenarioWarning[] }[] = [];
  for (const ref of record.versions) {
    const { head, version } = await requireVersion(actor, ref.scenarioId, ref.version);
    if (version.warnings.length > 0) warned.push({ title: versionTitle(head.name, version.number), warnings: version.warnings });
  }
  const acknowledgement = requireAcknowledgement(warned, input.acknowledgement);
  return storeShare(
    actor,
    {
      objectType: "comparison",
      objectId: record.id,
      scenarioId: null,
      versionNumber: null,
      comparisonId: record.id,
      title: `the comparison “${record.name}”`,
      link: comparisonPath(record.id),
      recipients,
      note: (input.note ?? "").trim(),
      acknowledgement,
      auditDetails: { name: record.name, versions: record.versions.map((ref) => `${ref.scenarioId}#${ref.version}`), warned: warned.map((item) => item.title) },
    },
    options,
  );
}

const sharers = alias(users, "sharers");

/** What was shared with a member in this workspace, newest first. */
export async function listSharedWithUser(input: { workspaceId: string; userId: string; limit?: number }): Promise<SharedWithMeDto[]> {
  const rows = await db
    .select({
      shareId: shares.id,
      objectType: shares.objectType,
      scenarioId: shares.scenarioId,
      versionNumber: shares.versionNumber,
      comparisonId: shares.comparisonId,
      scenarioName: scenarios.name,
      comparisonName: comparisons.name,
      sharedByName: sharers.name,
      sharedAt: shares.createdAt,
      note: shares.note,
      acknowledgement: shares.acknowledgement,
    })
    .from(shareRecipients)
    .innerJoin(shares, eq(shares.id, shareRecipients.shareId))
    .leftJoin(scenarios, eq(scenarios.id, shares.scenarioId))
    .leftJoin(comparisons, eq(comparisons.id, shares.comparisonId))
    .leftJoin(sharers, eq(sharers.id, shares.sharedBy))
    .where(and(eq(shareRecipients.userId, input.userId), eq(shares.workspaceId, input.workspaceId)))
    .orderBy(desc(shares.createdAt))
    .limit(Math.min(input.limit ?? 50, 200));
  return rows.map((row) => ({
    shareId: row.shareId,
    objectType: row.objectType,
    title: row.objectType === "comparison" ? `Comparison “${row.comparisonName ?? "?"}”` : versionTitle(row.scenarioName ?? "?", row.versionNumber ?? 0),
    link: row.objectType === "comparison" ? comparisonPath(row.comparisonId as string) : versionReviewPath(row.scenarioId as string, row.versionNumber ?? 1),
    sharedByName: row.sharedByName,
    sharedAt: row.sharedAt.toISOString(),
    note: row.note,
    acknowledgement: row.acknowledgement,
  }));
}

/**
 * Who each of a scenario's versions was shared with, for the scenario page: shares of the version
 * itself and of comparisons that show it (one entry per version and share).
 */
export async function listSharesOfScenario(scenarioId: string): Promise<{ version: number; recipients: string[]; sharedAt: string; sharedByName: string | null }[]> {
  const direct = await db
    .select({ id: shares.id, version: shares.versionNumber, sharedAt: shares.createdAt, sharedByName: sharers.name })
    .from(shares)
    .leftJoin(sharers, eq(sharers.id, shares.sharedBy))
    .where(eq(shares.scenarioId, scenarioId))
    .orderBy(desc(shares.createdAt))
    .limit(200);
  const viaComparisons = await db
    .select({ id: shares.id, version: comparisonVersions.versionNumber, sharedAt: shares.createdAt, sharedByName: sharers.name })
    .from(comparisonVersions)
    .innerJoin(shares, eq(shares.comparisonId, comparisonVersions.comparisonId))
    .leftJoin(sharers, eq(sharers.id, shares.sharedBy))
    .where(eq(comparisonVersions.scenarioId, scenarioId))
    .orderBy(desc(shares.createdAt))
    .limit(200);
  const rows = [...direct, ...viaComparisons];
  if (rows.length === 0) return [];
  const people = await db
    .select({ shareId: shareRecipients.shareId, name: users.name, email: users.email })
    .from(shareRecipients)
    .innerJoin(users, eq(users.id, shareRecipients.userId))
    .where(inArray(shareRecipients.shareId, [...new Set(rows.map((row) => row.id))]));
  return rows.map((row) => ({
    version: row.version ?? 0,
    recipients: people.filter((person) => person.shareId === row.id).map((person) => person.name ?? person.email),
    sharedAt: row.sharedAt.toISOString(),
    sharedByName: row.sharedByName,
  }));
}
