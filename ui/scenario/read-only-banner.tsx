export interface ReadOnlyBannerProps {
  /** The member's roles as words, e.g. "Finance" or "Reviewer · Admin". */
  roles: string;
  /** What the member may still do here (from their permissions; the server checks each again). */
  can: { compare: boolean; comment: boolean; decide: boolean };
}

/** "You can …" for a member who may read a scenario but not plan it. */
export function readOnlyActions(can: ReadOnlyBannerProps["can"]): string {
  const review = can.comment && can.decide ? "comment on, sign off or decline" : can.comment ? "comment on" : can.decide ? "sign off or decline" : null;
  const actions = [
    "open any saved version from Version history",
    can.compare ? "put versions side by side" : null,
    review ? `${review} versions shared with you in Finance review below` : null,
  ].filter((item): item is string => item !== null);
  const list = actions.length === 1 ? actions[0] : `${actions.slice(0, -1).join(", ")} and ${actions.at(-1)}`;
  return `You can ${list}.`;
}

/**
 * The scenario room's notice for members without scenario:write: the plan is shown exactly as saved,
 * every control is disabled, and this says why and what they can do instead.
 */
export function ReadOnlyBanner({ roles, can }: ReadOnlyBannerProps) {
  return (
    <div data-testid="read-only-banner" role="note" className="rounded-md border-l-4 border-shallows bg-white px-4 py-3 text-sm text-slate-800 shadow-sm">
      <p>
        <strong className="font-semibold text-river">Read-only for you.</strong> Your roles ({roles}) do not include planning, so the amounts, locks, bounds and controls below show
        the saved plan and cannot be changed; only planners save versions. {readOnlyActions(can)}
      </p>
    </div>
  );
}
