import Link from "next/link";
import type { Metadata } from "next";
import { auth } from "@/server/auth";
import { PASSWORD_MIN_LENGTH } from "@/server/auth/password";
import { roleLabels } from "@/server/authz";
import { getInvitationByToken } from "@/server/data/invitations";
import { RoleBadge } from "@/ui/section";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { signOutForInvitationAction } from "./actions";
import { JoinForm, NewAccountForm } from "./invite-forms";

export const metadata: Metadata = { title: "Invitation" };

function Shell({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center px-4 py-12">
      <div className="w-full max-w-md">
        <p className="mb-8 text-center text-3xl font-semibold tracking-tight text-river">Tributary</p>
        <div className="rounded-lg border border-slate-200 bg-white p-6 shadow-sm">
          <h1 className="mb-4 text-xl font-semibold text-river">{title}</h1>
          {children}
        </div>
      </div>
    </main>
  );
}

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = await getInvitationByToken(token);
  if (!invitation) {
    return (
      <Shell title="Invitation not found">
        <p className="text-slate-700">This invitation link is not valid. Check that you copied the whole link, or ask an admin for a new invitation.</p>
      </Shell>
    );
  }
  if (invitation.status !== "pending") {
    const text = {
      accepted: "This invitation has already been used.",
      revoked: "This invitation was withdrawn. Ask an admin of the workspace for a new one.",
      expired: "This invitation has expired. Ask an admin of the workspace for a new one.",
    }[invitation.status];
    return (
      <Shell title={`Invitation to ${invitation.workspaceName}`}>
        <p role="alert" className="text-slate-700">{text}</p>
        <p className="mt-4 text-sm">
          <Link href="/login" className={textLinkClass}>Go to sign-in</Link>
        </p>
      </Shell>
    );
  }

  const session = await auth();
  const intro = (
    <div className="mb-5 text-slate-700">
      <p>
        You are invited to <strong>{invitation.workspaceName}</strong> as:
      </p>
      <p className="mt-2 flex flex-wrap gap-1">
        {invitation.roles.map((role) => (
          <RoleBadge key={role}>{roleLabels[role]}</RoleBadge>
        ))}
      </p>
    </div>
  );

  if (!invitation.accountExists) {
    return (
      <Shell title={`Join ${invitation.workspaceName}`}>
        {intro}
        <NewAccountForm token={token} email={invitation.email} minLength={PASSWORD_MIN_LENGTH} />
      </Shell>
    );
  }
  const signedInAsInvitee = session?.user?.email?.toLowerCase() === invitation.email;
  return (
    <Shell title={`Join ${invitation.workspaceName}`}>
      {intro}
      {signedInAsInvitee ? (
        <JoinForm token={token} />
      ) : session?.user ? (
        <form action={signOutForInvitationAction} className="flex flex-col gap-3 text-slate-700">
          <p>
            This invitation is for <strong>{invitation.email}</strong>, but you are signed in as <strong>{session.user.email}</strong>.
          </p>
          <input type="hidden" name="token" value={token} />
          <input type="hidden" name="email" value={invitation.email} />
          <button type="submit" className={buttonClass("primary")}>
            Sign out and sign in as {invitation.email}
          </button>
        </form>
      ) : (
        <p className="text-slate-700">
          You already have a Tributary account as <strong>{invitation.email}</strong>.{" "}
          <Link
            className={`font-medium ${textLinkClass}`}
            href={`/login?${new URLSearchParams({ callbackUrl: `/invite/${token}`, email: invitation.email })}`}
          >
            Sign in as {invitation.email}
          </Link>{" "}
          to join.
        </p>
      )}
    </Shell>
  );
}
