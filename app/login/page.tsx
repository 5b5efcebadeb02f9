import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { auth } from "@/server/auth";
import { LoginForm } from "./login-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function LoginPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string; email?: string }> }) {
  const { callbackUrl, email } = await searchParams;
  const session = await auth();
  const target = callbackUrl?.startsWith("/") && !callbackUrl.startsWith("//") ? callbackUrl : "/";
  if (session?.user?.id) redirect(target);
  return (
    <main className="flex min-h-screen flex-col items-center justify-center px-4 py-12">
      <div className="w-full max-w-sm">
        <p className="mb-2 text-center text-3xl font-semibold tracking-tight text-river">Tributary</p>
        <p className="mb-8 text-center text-sm text-slate-600">Plan marketing budgets on approved fits, with honest intervals.</p>
        <div className="rounded-lg border border-slate-200 bg-white p-6 shadow-sm">
          <h1 className="mb-4 text-xl font-semibold text-river">Sign in</h1>
          <LoginForm callbackUrl={target} email={typeof email === "string" ? email : undefined} />
        </div>
      </div>
    </main>
  );
}
