import "server-only";
import { type Actor, can } from "@/server/authz";
import { listCommentsByVersions } from "@/server/comments/store";
import type { ComparisonDto } from "@/server/comparisons/types";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { moneyOf } from "@/server/predict/service";
import type { ComparisonScreenProps } from "@/ui/compare/comparison-screen";

/** The workspace's people: everyone can be mentioned; finance members can be shared with. */
export async function reviewPeople(workspaceId: string) {
  const members = await listMembersByWorkspaceId(workspaceId);
  return {
    members: members.map((member) => ({ userId: member.userId, name: member.name, email: member.email })),
    financeMembers: members.filter((member) => member.roles.includes("finance")).map((member) => ({ userId: member.userId, name: member.name, email: member.email })),
  };
}

/** Everything the side-by-side screen shows besides the comparison: comments, people, what the actor may do. */
export async function comparisonScreenProps(actor: Actor, comparison: ComparisonDto): Promise<ComparisonScreenProps> {
  const [comments, people] = await Promise.all([
    listCommentsByVersions(comparison.columns.map((column) => ({ scenarioId: column.scenarioId, version: column.version }))),
    reviewPeople(actor.workspaceId),
  ]);
  return {
    comparison,
    money: moneyOf(actor),
    comments,
    ...people,
    currentUserId: actor.userId,
    can: {
      save: can(actor, "comparison:write"),
      share: can(actor, "scenario:share"),
      comment: can(actor, "comment:write"),
      decide: can(actor, "signoff:decide"),
    },
  };
}
