"use client";
import { useEffect } from "react";

/**
 * Shown when a page fails while rendering on the server (e.g. the database does not answer). Production
 * builds hide the cause from the browser; the server log has it, under the same digest.
 */
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.warn(`Page error${error.digest ? ` ${error.digest}` : ""}`);
  }, [error]);
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-12">
      <p className="text-sm font-medium uppercase tracking-wide text-ember">Something went wrong</p>
      <h1 className="mt-2 text-2xl font-semibold text-river">This page could not be loaded</h1>
      <p className="mt-3 text-slate-700" role="alert">
        The server could not finish this page. If the database is restarting, it will be back in a moment.
        {error.digest ? <span className="mt-2 block text-sm text-slate-600">Reference: {error.digest}</span> : null}
      </p>
      <p className="mt-6">
        <button type="button" onClick={reset} className="rounded-md bg-shallows px-4 py-2 text-sm font-medium text-white hover:bg-river">
          Try again
        </button>
      </p>
    </main>
  );
}
