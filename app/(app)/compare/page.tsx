import type { Metadata } from "next";
import Link from "next/link";
import { can, requirePageActor } from "@/server/authz";
import { listSharedWithUser } from "@/server/comparisons/share";
import { listComparisonsByWorkspace } from "@/server/comparisons/store";
import { moneyOf } from "@/server/predict/service";
import { listScenariosByWorkspace, listVersionSummaries } from "@/server/scenarios/store";
import { listScenarioSignoffOverview, listSignoffsByScenarios } from "@/server/signoffs/store";
import { dateText } from "@/ui/compare/format";
import { SignoffBadge } from "@/ui/compare/signoff-badge";
import { type PickableScenario, VersionPicker } from "@/ui/compare/version-picker";
import { PageHeading, Section } from "@/ui/section";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Side by side" };

/** How many of the newest scenarios the picker offers. */
const PICKER_SCENARIOS = 50;

export default async function ComparePage() {
  const actor = await requirePageActor("comparison:read");
  const money = moneyOf(actor);
  const readsScenarios = can(actor, "scenario:read");
  const [saved, shared, overview] = await Promise.all([
    listComparisonsByWorkspace(actor.workspaceId),
    listSharedWithUser({ workspaceId: actor.workspaceId, userId: actor.userId }),
    readsScenarios ? listScenarioSignoffOverview(actor.workspaceId) : Promise.resolve([]),
  ]);
  let pickable: PickableScenario[] = [];
  if (readsScenarios) {
    const scenarios = (await listScenariosByWorkspace({ workspaceId: actor.workspaceId })).filter((scenario) => scenario.latestVersion !== null).slice(0, PICKER_SCENARIOS);
    const [versions, decisions] = await Promise.all([
      Promise.all(scenarios.map((scenario) => listVersionSummaries(scenario.id))),
      listSignoffsByScenarios(scenarios.map((scenario) => scenario.id)),
    ]);
    pickable = scenarios.map((scenario, index) => ({
      id: scenario.id,
      name: scenario.name,
      fitName: scenario.fitName,
      versions: versions[index].map((version) => ({
        number: version.number,
        total: version.total,
        note: version.note,
        createdAt: version.createdAt,
        warned: version.warningKinds.length > 0,
        decision: decisions.find((decision) => decision.scenarioId === scenario.id && decision.version === version.number) ?? null,
      })),
    }));
  }

  return (
    <div className="space-y-6">
      <PageHeading title="Side by side">Two to four scenario versions next to each other, with each plan&apos;s difference from a baseline, comments and finance sign-off.</PageHeading>

      {shared.length > 0 ? (
        <Section id="shared" title="Shared with you" description="Plans planners sent you for review.">
          <ul className="divide-y divide-slate-100" data-testid="shared-with-me">
            {shared.map((item) => (
              <li key={item.shareId} className="py-2">
                <Link href={item.link} className={`font-medium ${textLinkClass}`}>
                  {item.title}
                </Link>
                <span className="ml-2 text-sm text-slate-600">
                  from {item.sharedByName ?? "—"}, {dateText(item.sharedAt, money.locale)}
                </span>
                {item.note ? <p className="text-sm italic text-slate-700">“{item.note}”</p> : null}
                {item.acknowledgement ? (
                  <p className="mt-1 border-l-4 border-ember pl-2 text-sm text-slate-800">Carries extrapolation warnings; acknowledged: “{item.acknowledgement}”</p>
                ) : null}
              </li>
            ))}
          </ul>
        </Section>
      ) : null}

      <Section id="saved" title="Saved comparisons">
        {saved.length === 0 ? (
          <p className="text-sm text-slate-700">None saved yet. Pick versions below, then save the comparison to share it with finance.</p>
        ) : (
          <table className="num w-full text-sm" data-testid="saved-comparisons">
            <thead>
              <tr className="text-left text-xs text-slate-600">
                <th className="py-1 font-medium">Comparison</th>
                <th className="py-1 font-medium">Versions and finance status</th>
                <th className="py-1 font-medium">Saved by</th>
                <th className="py-1 text-right font-medium">Saved</th>
              </tr>
            </thead>
            <tbody>
              {saved.map((comparison) => (
                <tr key={comparison.id} className="border-t border-slate-100 align-top">
                  <td className="py-2">
                    <Link href={`/compare/${comparison.id}`} className={`font-medium ${textLinkClass}`}>
                      {comparison.name}
                    </Link>
                  </td>
                  <td className="py-2">
                    <ul className="space-y-1">
                      {comparison.versions.map((version, index) => (
                        <li key={`${version.scenarioId}:${version.version}`} className="flex flex-wrap items-center gap-2">
                          <span>
                            {version.scenarioName} v{version.version}
                            {index === comparison.baselinePosition ? <span className="ml-1 text-xs text-slate-600">(baseline)</span> : null}
                          </span>
                          <SignoffBadge signoff={version.decision ? { decision: version.decision, decidedByName: null, decidedAt: "", reason: "" } : null} locale={money.locale} />
                        </li>
                      ))}
                    </ul>
                  </td>
                  <td className="py-2">{comparison.createdByName ?? "—"}</td>
                  <td className="py-2 text-right">{dateText(comparison.createdAt, money.locale)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Section>

      {readsScenarios ? (
        <Section id="pick" title="Compare versions" description="Pick 2 to 4 versions of any scenarios, and the baseline the differences are measured from.">
          <VersionPicker scenarios={pickable} money={money} />
        </Section>
      ) : null}

      {readsScenarios && overview.length > 0 ? (
        <Section id="status" title="Sign-off status by scenario" description="A sign-off belongs to one version: a later version needs its own.">
          <table className="num w-full text-sm" data-testid="signoff-overview">
            <thead>
              <tr className="text-left text-xs text-slate-600">
                <th className="py-1 font-medium">Scenario</th>
                <th className="py-1 font-medium">Owner</th>
                <th className="py-1 font-medium">Latest version</th>
                <th className="py-1 font-medium">Signed off</th>
              </tr>
            </thead>
            <tbody>
              {overview.map((row) => (
                <tr key={row.scenarioId} className="border-t border-slate-100" data-testid="signoff-overview-row" data-scenario={row.scenarioId}>
                  <td className="py-2">
                    <Link href={`/scenarios/${row.scenarioId}#review`} className={`font-medium ${textLinkClass}`}>
                      {row.scenarioName}
                    </Link>
                  </td>
                  <td className="py-2">{row.ownerName ?? "—"}</td>
                  <td className="py-2">{row.latestVersion === null ? "none saved" : <SignoffBadge signoff={row.latestDecision} version={row.latestVersion} locale={money.locale} />}</td>
                  <td className="py-2">{row.signedOffVersion === null ? "—" : `version ${row.signedOffVersion}`}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Section>
      ) : null}
    </div>
  );
}
