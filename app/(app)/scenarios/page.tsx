import type { Metadata } from "next";
import Link from "next/link";
import { can, requirePageActor } from "@/server/authz";
import { listApprovedFits, listScenariosByWorkspace } from "@/server/scenarios/store";
import { listScenarioSignoffSummaries } from "@/server/signoffs/summary";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { SignoffSummary } from "@/ui/compare/signoff-summary";
import { PageHeading, Section } from "@/ui/section";

export const metadata: Metadata = { title: "Scenarios" };

export default async function ScenariosPage({ searchParams }: { searchParams: Promise<{ fitId?: string }> }) {
  const actor = await requirePageActor("scenario:read");
  const { fitId } = await searchParams;
  const validFit = fitId && /^[0-9a-f-]{36}$/i.test(fitId) ? fitId : undefined;
  const [scenarios, approved, signoffs] = await Promise.all([
    listScenariosByWorkspace({ workspaceId: actor.workspaceId, fitId: validFit }),
    listApprovedFits(actor.workspaceId),
    listScenarioSignoffSummaries(actor.workspaceId),
  ]);
  const when = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });
  const canWrite = can(actor, "scenario:write");
  return (
    <div className="space-y-6">
      <PageHeading title="Scenarios">Budget plans on approved fits. Each save is a version you can open, compare and restore.</PageHeading>
      {canWrite ? (
        <Section id="start" title="Start a scenario" description="Plan on an approved fit: move budget between channels and read the predicted outcome.">
          {approved.length === 0 ? (
            <p className="text-sm text-slate-700">No fit is approved yet. Analysts build fits; reviewers approve them.</p>
          ) : (
            <ul className="divide-y divide-slate-100">
              {approved.map((fit) => (
                <li key={fit.id} className="flex flex-wrap items-center justify-between gap-3 py-2">
                  <span>
                    <span className="font-medium text-river">{fit.name}</span>
                    {fit.approvedAt ? <span className="ml-2 text-sm text-slate-600">approved {when.format(new Date(fit.approvedAt))} UTC</span> : null}
                  </span>
                  <Link href={`/scenarios/new?fitId=${fit.id}`} className={buttonClass("primary")}>
                    Start a scenario on {fit.name}
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </Section>
      ) : null}
      <Section id="list" title={validFit ? "Scenarios on this fit" : "All scenarios"}>
        {scenarios.length === 0 ? (
          <p className="text-sm text-slate-700">No scenarios yet.</p>
        ) : (
          <table className="num w-full text-sm" data-testid="scenario-list">
            <thead>
              <tr className="text-left text-xs text-slate-600">
                <th className="py-1 pr-4 font-medium">Scenario</th>
                <th className="py-1 pr-4 font-medium">Fit</th>
                <th className="py-1 pr-4 font-medium">Owner</th>
                <th className="py-1 text-right font-medium">Latest version</th>
                <th className="py-1 pr-4 pl-4 font-medium">Finance sign-off</th>
                <th className="py-1 text-right font-medium">Last saved (UTC)</th>
              </tr>
            </thead>
            <tbody>
              {scenarios.map((scenario) => {
                const signoff = signoffs.get(scenario.id);
                return (
                  <tr key={scenario.id} className="border-t border-slate-100" data-testid="scenario-row" data-scenario={scenario.id}>
                    <td className="py-2 pr-4">
                      <Link href={`/scenarios/${scenario.id}`} className={`font-medium ${textLinkClass}`}>
                        {scenario.name}
                      </Link>
                    </td>
                    <td className="py-2 pr-4">
                      {scenario.fitName}
                      {scenario.fitStatus !== "approved" ? <span className="ml-1 text-xs text-[#9f3f2c]">({scenario.fitStatus})</span> : null}
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">{scenario.ownerName ?? "—"}</td>
                    <td className="py-2 text-right whitespace-nowrap">{scenario.latestVersion === null ? "none saved" : `v${scenario.latestVersion}`}</td>
                    <td className="py-2 pr-4 pl-4">{signoff ? <SignoffSummary summary={signoff} /> : "—"}</td>
                    <td className="py-2 text-right">{scenario.latestSavedAt ? when.format(new Date(scenario.latestSavedAt)) : "—"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </Section>
    </div>
  );
}
