import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageActor } from "@/server/authz";
import { buildComparison } from "@/server/comparisons/compute";
import { isAppError } from "@/server/errors";
import { ComparisonScreen } from "@/ui/compare/comparison-screen";
import { comparisonScreenProps } from "../_review/load";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Side by side" };

/** 2–4 versions side by side before saving: /compare/view?v=<scenario id>:<version>&v=…&baseline=0 */
export default async function ComparisonPreviewPage({ searchParams }: { searchParams: Promise<{ v?: string | string[]; baseline?: string }> }) {
  const actor = await requirePageActor("comparison:read");
  const query = await searchParams;
  const values = Array.isArray(query.v) ? query.v : query.v ? [query.v] : [];
  const refs = values.map((value) => /^([0-9a-f-]{36}):(\d{1,9})$/i.exec(value)).filter((match) => match !== null).map((match) => ({ scenarioId: match[1], version: Number(match[2]) }));
  const baseline = query.baseline && /^[0-3]$/.test(query.baseline) ? Number(query.baseline) : 0;
  if (refs.length !== values.length) notFound();
  try {
    const comparison = await buildComparison(actor, { refs, baselinePosition: baseline < refs.length ? baseline : 0 });
    return <ComparisonScreen {...await comparisonScreenProps(actor, comparison)} />;
  } catch (error) {
    if (isAppError(error) && error.type === "not_found") notFound();
    if (isAppError(error) && error.type === "invalid") {
      return (
        <div className="space-y-3">
          <h1 className="text-2xl font-semibold text-river">Side by side</h1>
          <p role="alert" className="rounded-md border-l-4 border-ember bg-white px-4 py-3 text-sm">
            {error.message}
          </p>
          <Link href="/compare" className={textLinkClass}>
            Pick versions again
          </Link>
        </div>
      );
    }
    throw error;
  }
}
