"use client";

import dynamic from "next/dynamic";

/**
 * The scenario page's finance review, loaded after the first paint: it sits below the room and the
 * response curves, and its forms (decision, sharing, comments) are not needed before the room works.
 * The placeholder holds the section's heading and place.
 */
export const ScenarioReviewLazy = dynamic(() => import("./scenario-review").then((module) => module.ScenarioReview), {
  ssr: false,
  loading: () => (
    <section aria-labelledby="review-heading" aria-busy="true" className="min-h-40 rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
      <h2 id="review-heading" className="text-lg font-semibold text-river">
        Finance review
      </h2>
      <p className="mt-1 text-sm text-slate-600">Loading the versions&apos; sign-offs and comments…</p>
    </section>
  ),
});
