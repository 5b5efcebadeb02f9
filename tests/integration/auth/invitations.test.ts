import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { invitations, users } from "@/db/schema";
import { verifyPassword } from "@/server/auth/password";
import { acceptInvitation, createInvitation, getInvitationByToken, listPendingInvitations, revokeInvitation } from "@/server/data/invitations";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { db, makeWorkspace, uniq } from "./helpers";

const newcomer = () => `${uniq("new")}@Test.Example`;

describe("invitations", () => {
  it("store only a hash of the one-time link token and expire after 7 days", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"] });
    const { token, invitation } = await createInvitation({ workspaceId: workspace.id, email: newcomer(), roles: ["analyst"], invitedBy: members.boss.id });
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const [row] = await db().select().from(invitations).where(eq(invitations.id, invitation.id));
    expect(JSON.stringify(row)).not.toContain(token);
    expect(row.email).toBe(invitation.email.toLowerCase());
    const days = (row.expiresAt.getTime() - row.createdAt.getTime()) / 86_400_000;
    expect(days).toBeCloseTo(7, 3);
    expect((await getInvitationByToken(token))?.status).toBe("pending");
  });

  it("let a new person set name and password and join with the invited roles, once", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"] });
    const email = newcomer();
    const { token } = await createInvitation({ workspaceId: workspace.id, email, roles: ["reviewer", "finance"], invitedBy: members.boss.id });
    const joined = await acceptInvitation({ token, newAccount: { name: "Nia New", password: "a fine password" } });
    expect(joined.roles).toEqual(["reviewer", "finance"]);
    expect(joined.user.email).toBe(email.toLowerCase());

    const [user] = await db().select().from(users).where(eq(users.email, email.toLowerCase()));
    expect(await verifyPassword(user.passwordHash!, "a fine password")).toBe(true);
    const member = (await listMembersByWorkspaceId(workspace.id)).find((m) => m.userId === user.id);
    expect(member?.roles).toEqual(["reviewer", "finance"]);

    await expect(acceptInvitation({ token, newAccount: { name: "Again", password: "another password" } })).rejects.toMatchObject({
      status: 409,
      message: expect.stringMatching(/already been used/),
    });
    expect((await getInvitationByToken(token))?.status).toBe("accepted");
    expect(await listPendingInvitations(workspace.id)).toEqual([]);
  });

  it("refuse an expired link", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"] });
    const { token, invitation } = await createInvitation({ workspaceId: workspace.id, email: newcomer(), roles: ["planner"], invitedBy: members.boss.id });
    await db().update(invitations).set({ expiresAt: sql`now() - interval '1 minute'` }).where(eq(invitations.id, invitation.id));
    expect((await getInvitationByToken(token))?.status).toBe("expired");
    await expect(acceptInvitation({ token, newAccount: { name: "Late", password: "a fine password" } })).rejects.toMatchObject({
      status: 409,
      message: expect.stringMatching(/expired/),
    });
    expect(await listMembersByWorkspaceId(workspace.id)).toHaveLength(1);
  });

  it("refuse a withdrawn link and an unknown one", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"] });
    const { token, invitation } = await createInvitation({ workspaceId: workspace.id, email: newcomer(), roles: ["planner"], invitedBy: members.boss.id });
    await revokeInvitation({ workspaceId: workspace.id, invitationId: invitation.id, actorUserId: members.boss.id });
    await expect(acceptInvitation({ token, newAccount: { name: "X", password: "a fine password" } })).rejects.toMatchObject({ status: 409 });
    await expect(acceptInvitation({ token: "A".repeat(43), newAccount: { name: "X", password: "a fine password" } })).rejects.toMatchObject({ status: 404 });
    expect(await getInvitationByToken("not-a-token")).toBeNull();
  });

  it("make someone with an account sign in as the invited address, then widen their roles", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], ana: ["analyst"] });
    const elsewhere = await makeWorkspace({ pat: ["planner"] });
    const { token } = await createInvitation({ workspaceId: workspace.id, email: elsewhere.members.pat.email, roles: ["finance"], invitedBy: members.boss.id });
    expect((await getInvitationByToken(token))?.accountExists).toBe(true);
    await expect(acceptInvitation({ token, newAccount: { name: "Pat", password: "takeover attempt" } })).rejects.toMatchObject({ status: 403 });
    await expect(acceptInvitation({ token, signedInUserId: members.ana.id })).rejects.toMatchObject({ status: 403 });
    const joined = await acceptInvitation({ token, signedInUserId: elsewhere.members.pat.id });
    expect(joined.roles).toEqual(["finance"]);
  });

  it("are refused for someone who is already a member, and replace an earlier pending one", async () => {
    const { workspace, members } = await makeWorkspace({ boss: ["admin"], ana: ["analyst"] });
    await expect(createInvitation({ workspaceId: workspace.id, email: members.ana.email, roles: ["planner"], invitedBy: members.boss.id })).rejects.toMatchObject({
      status: 409,
    });
    const email = newcomer();
    const first = await createInvitation({ workspaceId: workspace.id, email, roles: ["planner"], invitedBy: members.boss.id });
    await createInvitation({ workspaceId: workspace.id, email, roles: ["finance"], invitedBy: members.boss.id });
    expect((await getInvitationByToken(first.token))?.status).toBe("revoked");
    expect((await listPendingInvitations(workspace.id)).map((i) => i.roles)).toEqual([["finance"]]);
  });
});
