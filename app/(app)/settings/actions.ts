"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { action, formList } from "@/server/http/action";
import { appOrigin } from "@/server/http/origin";
import { roleNames } from "@/server/authz/roles";
import { createInvitation, revokeInvitation } from "@/server/data/invitations";
import { changeMemberRoles, removeMember } from "@/server/data/members";
import { updateWorkspaceSettings } from "@/server/data/workspaces";
import { invitationMail } from "@/server/mail/templates";
import { sendMail } from "@/server/mail/transport";
import { currencySchema, localeSchema } from "@/app/api/workspace/schema";

const rolesField = formList(z.enum(roleNames)).pipe(z.array(z.enum(roleNames)).min(1, "Choose at least one role."));

export const updateWorkspaceAction = action(
  z.object({ name: z.string().trim().min(1, "The name cannot be empty.").max(100), currency: currencySchema, locale: localeSchema }),
  { permission: "workspace:admin" },
  async (input, { actor }) => {
    await updateWorkspaceSettings({ workspaceId: actor.workspaceId, actorUserId: actor.userId, ...input });
    revalidatePath("/", "layout");
    return { message: `Saved. Amounts now show in ${input.currency}.` };
  },
);

export const inviteMemberAction = action(
  z.object({
    email: z.string().trim().min(1, "Enter the e-mail address to invite.").pipe(z.email("Enter a valid e-mail address, like name@example.com.")),
    roles: rolesField,
  }),
  { permission: "workspace:admin" },
  async (input, { actor }) => {
    const { token, invitation } = await createInvitation({
      workspaceId: actor.workspaceId,
      email: input.email,
      roles: input.roles,
      invitedBy: actor.userId,
    });
    revalidatePath("/settings");
    const link = `${await appOrigin()}/invite/${token}`;
    try {
      await sendMail(
        invitationMail({
          to: invitation.email,
          workspaceName: actor.workspaceName,
          inviterName: actor.name,
          roles: invitation.roles,
          link,
          expiresAt: invitation.expiresAt,
        }),
      );
    } catch (error) {
      console.error(`[mail] invitation not sent: ${error instanceof Error ? error.message.split("\n")[0] : "error"}`);
      return {
        message: `The invitation is saved, but the e-mail could not be sent (the mail server did not answer). Send ${invitation.email} this one-time link yourself: ${link}`,
      };
    }
    return { message: `Invitation sent to ${invitation.email}. The link works once, for 7 days.` };
  },
);

export const revokeInvitationAction = action(
  z.object({ invitationId: z.uuid() }),
  { permission: "workspace:admin" },
  async ({ invitationId }, { actor }) => {
    await revokeInvitation({ workspaceId: actor.workspaceId, invitationId, actorUserId: actor.userId });
    revalidatePath("/settings");
    return { message: "Invitation withdrawn." };
  },
);

export const changeRolesAction = action(
  z.object({ userId: z.string().min(1), roles: rolesField }),
  { permission: "workspace:admin" },
  async ({ userId, roles }, { actor }) => {
    const member = await changeMemberRoles({ workspaceId: actor.workspaceId, userId, roles, actorUserId: actor.userId });
    revalidatePath("/", "layout");
    return { message: `Roles of ${member.name ?? member.email} saved.` };
  },
);

export const removeMemberAction = action(
  z.object({ userId: z.string().min(1) }),
  { permission: "workspace:admin" },
  async ({ userId }, { actor }) => {
    await removeMember({ workspaceId: actor.workspaceId, userId, actorUserId: actor.userId });
    revalidatePath("/", "layout");
    return { message: "Member removed." };
  },
);
