import { and, desc, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { auditLog, memberships } from "@/db/schema";
import { listAuditEventsByWorkspaceId } from "@/server/data/audit";
import { changeMemberRoles, listMembersByWorkspaceId, removeMember } from "@/server/data/members";
import { describeAuditEvent } from "@/ui/audit-event";
import { db, makeWorkspace } from "./helpers";

describe("the last-admin rule", () => {
  it("keeps the admin role on the workspace's only admin", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], ana: ["analyst"] });
    await expect(
      changeMemberRoles({ workspaceId: workspace.id, userId: members.boss.id, roles: ["analyst"], actorUserId: members.boss.id }),
    ).rejects.toMatchObject({ status: 409, code: "conflict:last_admin", message: expect.stringMatching(/last admin/) });
    const [row] = await db().select({ roles: memberships.roles }).from(memberships).where(and(eq(memberships.workspaceId, workspace.id), eq(memberships.userId, members.boss.id)));
    expect(row.roles).toEqual(["admin"]);
  });

  it("refuses to remove the only admin", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], ana: ["analyst"] });
    await expect(removeMember({ workspaceId: workspace.id, userId: members.boss.id, actorUserId: members.boss.id })).rejects.toMatchObject({
      status: 409,
    });
    expect(await listMembersByWorkspaceId(workspace.id)).toHaveLength(2);
  });

  it("lets one of two admins step down or be removed, and logs it", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], deputy: ["admin", "finance"], ana: ["analyst"] });
    const member = await changeMemberRoles({ workspaceId: workspace.id, userId: members.deputy.id, roles: ["finance"], actorUserId: members.boss.id });
    expect(member.roles).toEqual(["finance"]);
    await expect(removeMember({ workspaceId: workspace.id, userId: members.boss.id, actorUserId: members.boss.id })).rejects.toMatchObject({ status: 409 });
    await removeMember({ workspaceId: workspace.id, userId: members.ana.id, actorUserId: members.boss.id });

    const entries = await db().select().from(auditLog).where(eq(auditLog.workspaceId, workspace.id)).orderBy(desc(auditLog.id));
    expect(entries.map((e) => e.action)).toEqual(["member.removed", "member.roles_changed"]);
    expect(entries[1].details).toEqual({ before: ["admin", "finance"], after: ["finance"] });
    expect(entries[1].actorUserId).toBe(members.boss.id);

    // As the home page's recent activity reads them: the member is named (looked up now, not stored).
    const events = await listAuditEventsByWorkspaceId({ workspaceId: workspace.id });
    expect(events.map((event) => describeAuditEvent(event))).toEqual([
      "removed ana from the workspace",
      "changed deputy's roles from admin, finance to finance",
    ]);
  });

  it("cannot be raced: two admins demoting each other at once leave exactly one admin", async () => {
    const { workspace, members } = await makeWorkspace({ a: ["admin"], b: ["admin"] });
    const results = await Promise.allSettled([
      changeMemberRoles({ workspaceId: workspace.id, userId: members.a.id, roles: ["analyst"], actorUserId: members.b.id }),
      changeMemberRoles({ workspaceId: workspace.id, userId: members.b.id, roles: ["analyst"], actorUserId: members.a.id }),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const admins = (await listMembersByWorkspaceId(workspace.id)).filter((m) => m.roles.includes("admin"));
    expect(admins).toHaveLength(1);
  });

  it("refuses an empty role list and members of other workspaces", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], ana: ["analyst"] });
    const other = await makeWorkspace({ stranger: ["analyst"] });
    await expect(changeMemberRoles({ workspaceId: workspace.id, userId: members.ana.id, roles: [], actorUserId: members.boss.id })).rejects.toMatchObject({ status: 422 });
    await expect(
      changeMemberRoles({ workspaceId: workspace.id, userId: other.members.stranger.id, roles: ["planner"], actorUserId: members.boss.id }),
    ).rejects.toMatchObject({ status: 404 });
    await expect(removeMember({ workspaceId: workspace.id, userId: other.members.stranger.id, actorUserId: members.boss.id })).rejects.toMatchObject({ status: 404 });
  });
});
