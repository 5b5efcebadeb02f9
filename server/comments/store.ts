import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "@/db/client";
import { comments, comparisonVersions, comparisons, users } from "@/db/schema";
import type { Actor } from "@/server/authz";
import { recordAudit } from "@/server/data/audit";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { AppError } from "@/server/errors";
import { comparisonPath, getScenarioOwnerId, requireVersion, versionReviewPath, versionTitle } from "@/server/comparisons/versions";
import { sendReviewMails } from "@/server/notifications/mail";
import { createNotifications, type NewNotification } from "@/server/notifications/store";
import { findMentions, type Mentionable } from "./mentions";

export type CommentDto = {
  id: string;
  scenarioId: string;
  version: number;
  parentId: string | null;
  comparisonId: string | null;
  authorId: string | null;
  authorName: string | null;
  body: string;
  /** Members the comment mentions (they were e-mailed). */
  mentions: { userId: string; name: string | null; email: string }[];
  createdAt: string;
};

const columns = {
  id: comments.id,
  scenarioId: comments.scenarioId,
  version: comments.versionNumber,
  parentId: comments.parentId,
  comparisonId: comments.comparisonId,
  authorId: comments.authorId,
  authorName: users.name,
  body: comments.body,
  mentionIds: comments.mentions,
  createdAt: comments.createdAt,
};

async function toDtos(rows: { [K in keyof typeof columns]: unknown }[]): Promise<CommentDto[]> {
  const typed = rows as ({ mentionIds: string[]; createdAt: Date } & Omit<CommentDto, "mentions" | "createdAt">)[];
  const ids = [...new Set(typed.flatMap((row) => row.mentionIds))];
  const people = ids.length ? await db.select({ userId: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids)) : [];
  const byId = new Map(people.map((person) => [person.userId, person]));
  return typed.map(({ mentionIds, createdAt, ...row }) => ({
    ...row,
    mentions: mentionIds.map((id) => byId.get(id)).filter((person): person is NonNullable<typeof person> => !!person),
    createdAt: createdAt.toISOString(),
  }));
}

/** A version's comments, oldest first (replies carry parentId; the UI nests them). */
export async function listCommentsByVersion(scenarioId: string, version: number): Promise<CommentDto[]> {
  const rows = await db
    .select(columns)
    .from(comments)
    .leftJoin(users, eq(users.id, comments.authorId))
    .where(and(eq(comments.scenarioId, scenarioId), eq(comments.versionNumber, version)))
    .orderBy(asc(comments.createdAt), asc(comments.id))
    .limit(1000);
  return toDtos(rows);
}

/** Comments on several versions (a comparison's columns, a scenario's versions), oldest first. */
export async function listCommentsByVersions(refs: { scenarioId: string; version: number }[]): Promise<CommentDto[]> {
  if (refs.length === 0) return [];
  const scenarioIds = [...new Set(refs.map((ref) => ref.scenarioId))];
  const wanted = new Set(refs.map((ref) => `${ref.scenarioId}#${ref.version}`));
  const rows = await db
    .select(columns)
    .from(comments)
    .leftJoin(users, eq(users.id, comments.authorId))
    .where(inArray(comments.scenarioId, scenarioIds))
    .orderBy(asc(comments.createdAt), asc(comments.id))
    .limit(5000);
  return toDtos(rows.filter((row) => wanted.has(`${row.scenarioId}#${row.version}`)));
}

export type PostCommentInput = {
  scenarioId: string;
  version: number;
  body: string;
  /** Reply to this comment (same version). */
  parentId?: string | null;
  /** Written in this comparison (it must show the version); links in notifications go back to it. */
  comparisonId?: string | null;
};

/**
 * Posts a comment on one version (404 for another workspace's scenario or a missing version; 422
 * for a parent on another version or a comparison without the version). Mentioned members get an
 * e-mail and a notification; the parent's author and the scenario's owner a notification. The
 * comment, its audit entry and the notifications commit together; e-mails go after.
 */
export async function postComment(actor: Actor, input: PostCommentInput): Promise<CommentDto> {
  const { head, version } = await requireVersion(actor, input.scenarioId, input.version);
  const body = input.body.trim();
  if (body === "") throw new AppError("invalid:comment", "Write a comment first.", { details: [{ path: "body", message: "Empty comment." }] });

  let parentAuthorId: string | null = null;
  if (input.parentId) {
    const [parent] = await db
      .select({ scenarioId: comments.scenarioId, version: comments.versionNumber, authorId: comments.authorId })
      .from(comments)
      .where(eq(comments.id, input.parentId));
    if (!parent || parent.scenarioId !== head.id || parent.version !== version.number) {
      throw new AppError("invalid:comment", `Reply to a comment on version ${version.number} of this scenario.`, {
        details: [{ path: "parentId", message: "No such comment on this version." }],
      });
    }
    parentAuthorId = parent.authorId;
  }
  if (input.comparisonId) {
    const [shown] = await db
      .select({ workspaceId: comparisons.workspaceId })
      .from(comparisonVersions)
      .innerJoin(comparisons, eq(comparisons.id, comparisonVersions.comparisonId))
      .where(
        and(
          eq(comparisonVersions.comparisonId, input.comparisonId),
          eq(comparisonVersions.scenarioId, head.id),
          eq(comparisonVersions.versionNumber, version.number),
        ),
      );
    if (!shown || shown.workspaceId !== actor.workspaceId) {
      throw new AppError("invalid:comment", "That comparison does not show this version.", { details: [{ path: "comparisonId", message: "Not in the comparison." }] });
    }
  }

  const members: Mentionable[] = (await listMembersByWorkspaceId(actor.workspaceId)).map((member) => ({ userId: member.userId, name: member.name, email: member.email }));
  const mentioned = findMentions(body, members).filter((member) => member.userId !== actor.userId);
  const ownerId = await getScenarioOwnerId(head.id);
  const link = input.comparisonId ? comparisonPath(input.comparisonId) : versionReviewPath(head.id, version.number);
  const who = actor.name ?? actor.email;
  const title = versionTitle(head.name, version.number);

  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(comments)
      .values({
        workspaceId: actor.workspaceId,
        scenarioId: head.id,
        versionNumber: version.number,
        parentId: input.parentId ?? null,
        comparisonId: input.comparisonId ?? null,
        authorId: actor.userId,
        body,
        mentions: mentioned.map((member) => member.userId),
      })
      .returning({ id: comments.id });
    await recordAudit(
      {
        workspaceId: actor.workspaceId,
        actorUserId: actor.userId,
        action: input.parentId ? "comment.replied" : "comment.posted",
        objectType: "scenario",
        objectId: head.id,
        details: { version: version.number, name: head.name, commentId: row.id, parentId: input.parentId ?? null, mentions: mentioned.map((member) => member.email) },
      },
      tx,
    );
    const notified = new Set<string>([actor.userId]);
    const items: NewNotification[] = [];
    const add = (userId: string | null, kind: NewNotification["kind"], text: string) => {
      if (!userId || notified.has(userId)) return;
      notified.add(userId);
      items.push({ workspaceId: actor.workspaceId, userId, kind, title: text, link, actorId: actor.userId });
    };
    for (const member of mentioned) add(member.userId, "mention", `${who} mentioned you on ${title}.`);
    add(parentAuthorId, "reply", `${who} replied to your comment on ${title}.`);
    add(ownerId, "comment", `${who} commented on ${title}.`);
    await createNotifications(items, tx);
    return row.id;
  });

  await sendReviewMails(
    mentioned.map((member) => ({
      to: member.email,
      subject: `${who} mentioned you on ${title}`,
      headline: `${who} mentioned you in a comment on ${title}.`,
      quote: body,
      path: link,
      linkLabel: input.comparisonId ? "Open the comparison" : "Open the version",
      workspaceName: actor.workspaceName,
    })),
    "comments",
  );
  const [saved] = await db.select(columns).from(comments).leftJoin(users, eq(users.id, comments.authorId)).where(eq(comments.id, id));
  return (await toDtos([saved]))[0];
}
