"use server";
import { redirect } from "next/navigation";
import { z } from "zod";
import { auth, signIn, signOut } from "@/server/auth";
import { newPasswordSchema } from "@/server/auth/password";
import { setWorkspaceCookie } from "@/server/authz";
import { acceptInvitation } from "@/server/data/invitations";
import { getWorkspaceById } from "@/server/data/workspaces";
import { toAppError } from "@/server/errors";
import type { ActionState } from "@/server/http/action";

const newAccountSchema = z
  .object({
    token: z.string().min(1),
    name: z.string().trim().min(1, "Enter your name.").max(100, "Use at most 100 characters."),
    password: newPasswordSchema,
    confirmPassword: z.string(),
  })
  .refine((input) => input.password === input.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ." });

async function rememberWorkspace(workspaceId: string) {
  const workspace = await getWorkspaceById(workspaceId);
  if (workspace) await setWorkspaceCookie(workspace.slug);
}

/** A new person: create the account with the invited roles, then sign them in. */
export async function acceptWithNewAccountAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const parsed = newAccountSchema.safeParse(Object.fromEntries(formData));
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) (fieldErrors[issue.path.join(".")] ??= []).push(issue.message);
    return { status: "invalid_data", message: parsed.error.issues[0].message, fieldErrors };
  }
  let joined: Awaited<ReturnType<typeof acceptInvitation>>;
  try {
    joined = await acceptInvitation({ token: parsed.data.token, newAccount: { name: parsed.data.name, password: parsed.data.password } });
  } catch (error) {
    return { status: "error", message: toAppError(error, "invitation").message };
  }
  await rememberWorkspace(joined.workspaceId);
  await signIn("credentials", { email: joined.user.email, password: parsed.data.password, redirectTo: "/" });
  return { status: "success" };
}

/** Someone with an account, signed in as the invited address: join the workspace. */
export async function acceptAsSignedInUserAction(_previous: ActionState, formData: FormData): Promise<ActionState> {
  const session = await auth();
  if (!session?.user?.id) redirect(`/login?callbackUrl=${encodeURIComponent(`/invite/${String(formData.get("token") ?? "")}`)}`);
  let joined: Awaited<ReturnType<typeof acceptInvitation>>;
  try {
    joined = await acceptInvitation({ token: String(formData.get("token") ?? ""), signedInUserId: session.user.id });
  } catch (error) {
    return { status: "error", message: toAppError(error, "invitation").message };
  }
  await rememberWorkspace(joined.workspaceId);
  redirect("/");
}

/** Signed in as someone else: sign out and come back to this invitation through the sign-in page. */
export async function signOutForInvitationAction(formData: FormData): Promise<void> {
  const token = String(formData.get("token") ?? "");
  const email = String(formData.get("email") ?? "");
  await signOut({ redirectTo: `/login?${new URLSearchParams({ callbackUrl: `/invite/${token}`, email })}` });
}
