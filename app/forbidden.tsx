import { textLinkClass } from "@/ui/button-class";

/** Rendered with status 403 when requirePageActor finds the role missing. */
export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-12">
      <p className="text-sm font-medium uppercase tracking-wide text-ember">403 · Not for your roles</p>
      <h1 className="mt-2 text-2xl font-semibold text-river">Your roles in this workspace do not include this page</h1>
      <p className="mt-3 text-slate-700">Ask an admin of the workspace if you need another role.</p>
      <p className="mt-6">
        {/* A plain link: next/link here would ship its client code with every page, as these boundaries do. */}
        <a href="/" className={`font-medium ${textLinkClass}`}>Back to home</a>
      </p>
    </main>
  );
}
