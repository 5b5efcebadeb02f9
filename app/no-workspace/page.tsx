import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { auth, signOut } from "@/server/auth";
import { buttonClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "No workspace" };

async function signOutAction() {
  "use server";
  await signOut({ redirectTo: "/login" });
}

/** Signed in, but a member of no workspace (never invited, or removed from the last one). */
export default async function NoWorkspacePage() {
  const session = await auth();
  if (!session?.user) redirect("/login");
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-12">
      <h1 className="text-2xl font-semibold text-river">You are not in any workspace</h1>
      <p className="mt-3 text-slate-700">
        You are signed in as {session.user.email}, but no workspace has you as a member. Ask an admin of your team for an invitation.
      </p>
      <form action={signOutAction} className="mt-6">
        <button type="submit" className={buttonClass("secondary")}>Sign out</button>
      </form>
    </main>
  );
}
