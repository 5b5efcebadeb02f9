import { connection } from "next/server";
import { textLinkClass } from "@/ui/button-class";

export default async function NotFound() {
  // Rendered per request, not prebuilt: the page's scripts then carry the request's CSP nonce (proxy.ts)
  // and run, like every other page's.
  await connection();
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-12">
      <p className="text-sm font-medium uppercase tracking-wide text-slate-600">404</p>
      <h1 className="mt-2 text-2xl font-semibold text-river">Nothing here</h1>
      <p className="mt-3 text-slate-700">This page does not exist, or it belongs to another workspace.</p>
      <p className="mt-6">
        {/* A plain link: next/link here would ship its client code with every page, as these boundaries do. */}
        <a href="/" className={`font-medium ${textLinkClass}`}>Back to home</a>
      </p>
    </main>
  );
}
