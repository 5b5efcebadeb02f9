import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePageActor } from "@/server/authz";
import { getComparisonView } from "@/server/comparisons/compute";
import { isAppError } from "@/server/errors";
import { ComparisonScreen } from "@/ui/compare/comparison-screen";
import { comparisonScreenProps } from "../_review/load";

export const metadata: Metadata = { title: "Side by side" };

/** A saved comparison, opened by its link inside its workspace (404 anywhere else). */
export default async function ComparisonPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ baseline?: string }> }) {
  const actor = await requirePageActor("comparison:read");
  const { id } = await params;
  const { baseline } = await searchParams;
  if (!/^[0-9a-f-]{36}$/i.test(id)) notFound();
  const position = baseline !== undefined && /^[0-3]$/.test(baseline) ? Number(baseline) : undefined;
  let comparison;
  try {
    comparison = await getComparisonView(actor, id, position);
  } catch (error) {
    if (isAppError(error) && error.type === "not_found") notFound();
    throw error;
  }
  return <ComparisonScreen {...await comparisonScreenProps(actor, comparison)} />;
}
