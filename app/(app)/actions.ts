"use server";
import { redirect } from "next/navigation";
import { signOut } from "@/server/auth";
import { listActorWorkspaces, requireActor, setWorkspaceCookie } from "@/server/authz";

export async function signOutAction(): Promise<void> {
  await signOut({ redirectTo: "/login" });
}

/** Makes another of the member's workspaces the current one (the choice is kept in a cookie). */
export async function switchWorkspaceAction(formData: FormData): Promise<void> {
  const actor = await requireActor();
  const slug = String(formData.get("workspace") ?? "");
  const workspaces = await listActorWorkspaces(actor);
  if (workspaces.some((w) => w.workspaceSlug === slug)) {
    await setWorkspaceCookie(slug);
  }
  redirect("/");
}
