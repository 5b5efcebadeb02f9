import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { requirePageActor } from "@/server/authz";
import { AppError } from "@/server/errors";
import { compareFits, loadFitsToCompare, MAX_COMPARED_FITS } from "@/server/fits/comparison";
import { listFitsByWorkspaceId } from "@/server/fits/store";
import type { FitDto } from "@/server/fits/types";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { FitComparisonSummary, FitComparisonTerms } from "@/ui/fits/fit-comparison";
import { formatDateTime } from "@/ui/fits/format";
import { FitStatusBadge } from "@/ui/fits/status";
import { PageHeading, Section } from "@/ui/section";
import { Breadcrumb } from "@/ui/breadcrumb";

export const metadata: Metadata = { title: "Fits side by side" };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

/** `ids` as the chooser's form sends it (repeated) or as links write it (comma-separated); distinct, uuids only. */
function requestedIds(value: string | string[] | undefined): { ids: string[]; malformed: boolean } {
  const parts = (Array.isArray(value) ? value : value ? [value] : []).flatMap((part) => part.split(",")).map((part) => part.trim()).filter(Boolean);
  const ids = [...new Set(parts)];
  const malformed = ids.some((id) => !z.uuid().safeParse(id).success);
  return { ids: ids.filter((id) => z.uuid().safeParse(id).success), malformed };
}

export default async function CompareFitsPage({ searchParams }: Props) {
  const actor = await requirePageActor("fit:read");
  const query = await searchParams;
  const { ids, malformed } = requestedIds(query.ids);
  const choosing = query.choose !== undefined;
  const locale = actor.locale;

  let fits: FitDto[] | null = null;
  if (!choosing && !malformed && ids.length >= 2 && ids.length <= MAX_COMPARED_FITS) {
    // Another workspace's fit does not exist here, whatever else was asked for.
    fits = await loadFitsToCompare(actor, ids).catch((error: unknown) => {
      if (error instanceof AppError && error.status === 404) notFound();
      throw error;
    });
  }

  const heading = (
    <>
      <Breadcrumb trail={[{ href: "/fits", label: "Fits" }]} />
      <PageHeading title="Fits side by side">
        Whole-model figures and every term&apos;s estimate, one column per fit: how the numbers move as terms come and go.
      </PageHeading>
    </>
  );

  if (!fits) {
    const all = await listFitsByWorkspaceId({ workspaceId: actor.workspaceId });
    const problem = malformed
      ? "One of the fits asked for is not a valid id."
      : ids.length > MAX_COMPARED_FITS
        ? `Pick at most ${MAX_COMPARED_FITS} fits.`
        : ids.length === 1 && !choosing
          ? "Pick at least one more fit."
          : null;
    return (
      <div className="flex flex-col gap-2">
        {heading}
        <Section id="choose" title="Choose fits" description={`Two to ${MAX_COMPARED_FITS} fits of this workspace.`}>
          {all.length < 2 ? (
            <p className="text-sm text-slate-700">There is only {all.length === 1 ? "one fit" : "no fit"} in this workspace so far.</p>
          ) : (
            <form method="get" action="/fits/compare" className="flex flex-col gap-3">
              {problem ? (
                <p role="alert" className="rounded-md border-l-4 border-ember bg-white px-3 py-2 text-sm text-slate-900" data-testid="compare-problem">
                  {problem}
                </p>
              ) : null}
              <fieldset>
                <legend className="sr-only">Fits</legend>
                <ul className="flex flex-col gap-2">
                  {all.map((fit) => (
                    <li key={fit.id}>
                      <label className="flex flex-wrap items-center gap-2 text-sm">
                        <input type="checkbox" name="ids" value={fit.id} defaultChecked={ids.includes(fit.id)} className="accent-shallows" />
                        <span className="font-medium text-slate-900">{fit.name}</span>
                        <FitStatusBadge status={fit.status} />
                        <span className="text-slate-600">
                          {fit.datasetName ?? "—"} · n {fit.n.toLocaleString(locale)} · {formatDateTime(fit.updatedAt, locale)}
                        </span>
                      </label>
                    </li>
                  ))}
                </ul>
              </fieldset>
              <p>
                <button type="submit" className={buttonClass("primary")}>
                  Compare
                </button>
              </p>
            </form>
          )}
        </Section>
      </div>
    );
  }

  const comparison = compareFits(fits);
  const n = comparison.fits[0].n.toLocaleString(locale);
  return (
    <div className="flex flex-col gap-6">
      <div>
        {heading}
        <p
          className={`rounded-md border-l-4 px-3 py-2 text-sm ${comparison.sameRows ? "border-reed bg-white text-slate-800" : "border-ember bg-white text-slate-900"}`}
          data-testid="comparison-basis"
        >
          {comparison.sameRows
            ? `Same outcome on the same ${n} rows: adjusted R², σ, AIC, BIC and the held-out error compare directly, and the best of each is marked.`
            : "These fits differ in outcome or rows: AIC, BIC and errors do not compare across them, so none is marked best."}
        </p>
        <p className="mt-2 text-sm">
          <Link href={`/fits/compare?choose=1&ids=${comparison.fits.map((fit) => fit.id).join(",")}`} className={textLinkClass}>
            Change the fits compared
          </Link>
        </p>
      </div>
      <Section id="summary" title="Whole model" description="Lower AIC and BIC mean a better balance of fit and size among fits of the same rows.">
        <FitComparisonSummary comparison={comparison} locale={locale} />
      </Section>
      <Section id="terms" title="Terms" description="Each fit's estimate with its confidence interval and p-value.">
        <FitComparisonTerms comparison={comparison} locale={locale} />
        <p className="mt-3 text-sm text-slate-700" data-testid="shift-caution">
          {comparison.shiftingTerms.length > 0
            ? `${comparison.shiftingTerms.join(", ")} ${comparison.shiftingTerms.length === 1 ? "moves" : "move"} by more than half an interval (or change sign) between fits: such a term shares credit with terms another fit leaves out, so neither number is its effect alone. `
            : ""}
          These effects are associations in past data, not the result of changing one channel alone.
        </p>
      </Section>
    </div>
  );
}
