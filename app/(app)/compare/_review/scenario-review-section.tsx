import "server-only";
import { Suspense } from "react";
import { type Actor, can } from "@/server/authz";
import { listCommentsByVersions } from "@/server/comments/store";
import { listSharesOfScenario } from "@/server/comparisons/share";
import { moneyOf } from "@/server/predict/service";
import type { ScenarioDto } from "@/server/scenarios/types";
import { listSignoffsByScenario } from "@/server/signoffs/store";
import type { ReviewVersion } from "@/ui/compare/scenario-review";
import { ScenarioReviewLazy } from "@/ui/compare/scenario-review-lazy";
import { reviewPeople } from "./load";

/**
 * The scenario page's finance review (issue 6): each version's sign-off status, comments, sharing.
 * A server component the scenario page renders below its room; it loads its own data. The client part
 * (ui/compare/scenario-review.tsx) loads after the first paint.
 */
export async function ScenarioReviewSection({ actor, scenario }: { actor: Actor; scenario: ScenarioDto }) {
  const [decisions, comments, shares, people] = await Promise.all([
    listSignoffsByScenario(scenario.id),
    listCommentsByVersions(scenario.versions.map((version) => ({ scenarioId: scenario.id, version: version.number }))),
    listSharesOfScenario(scenario.id),
    reviewPeople(actor.workspaceId),
  ]);
  const versions: ReviewVersion[] = scenario.versions.map((version) => {
    const history = decisions.filter((decision) => decision.version === version.number);
    return {
      number: version.number,
      total: version.total,
      note: version.note,
      authorName: version.authorName,
      createdAt: version.createdAt,
      warned: version.warningKinds.length > 0,
      signoff: history[0] ?? null,
      history,
      sharedWith: [...new Set(shares.filter((share) => share.version === version.number).flatMap((share) => share.recipients))],
    };
  });
  return (
    <Suspense>
      <ScenarioReviewLazy
        scenarioId={scenario.id}
        scenarioName={scenario.name}
        versions={versions}
        comments={comments}
        {...people}
        currentUserId={actor.userId}
        money={moneyOf(actor)}
        can={{
          comment: can(actor, "comment:write"),
          decide: can(actor, "signoff:decide"),
          share: can(actor, "scenario:share"),
          compare: can(actor, "comparison:read"),
        }}
      />
    </Suspense>
  );
}
