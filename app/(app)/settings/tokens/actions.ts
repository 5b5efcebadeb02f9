"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { action, formOptional } from "@/server/http/action";
import { createApiToken, revokeApiToken } from "@/server/data/api-tokens";

export const createTokenAction = action(
  z.object({
    name: z.string().trim().min(1, "Give the token a name, e.g. what script uses it.").max(100, "Use at most 100 characters."),
    expiresOn: formOptional(z.iso.date("Choose a date, or leave it empty for no expiry.")),
  }),
  { permission: "token:manage" },
  async ({ name, expiresOn }, { actor }) => {
    // A date means "valid through that day" (UTC).
    const expiresAt = expiresOn ? new Date(`${expiresOn}T23:59:59.999Z`) : null;
    const { token, apiToken } = await createApiToken({ workspaceId: actor.workspaceId, userId: actor.userId, name, expiresAt });
    revalidatePath("/settings/tokens");
    return { message: `Token "${apiToken.name}" created. Copy it now: it is shown only once.`, data: { token } };
  },
);

export const revokeTokenAction = action(z.object({ tokenId: z.uuid() }), { permission: "token:manage" }, async ({ tokenId }, { actor }) => {
  const revoked = await revokeApiToken({ workspaceId: actor.workspaceId, userId: actor.userId, tokenId });
  revalidatePath("/settings/tokens");
  return { message: `Token "${revoked.name}" revoked; scripts using it now get 401.` };
});
