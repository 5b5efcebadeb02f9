import type { ReactNode } from "react";
import { can, listActorWorkspaces, requirePageActor, roleLabels, type Permission } from "@/server/authz";
import { countUnreadNotifications } from "@/server/notifications/store";
import { NotificationsLink } from "@/ui/compare/notifications-link";
import { UNREAD_POLL_MS } from "@/ui/notifications/poll";
import { signOutAction, switchWorkspaceAction } from "./actions";
import { NavLinks, type NavItem } from "./nav-links";

// Each entry shows only to members whose roles allow its page; the pages check again themselves.
const navigation: (NavItem & { permission?: Permission })[] = [
  { href: "/", label: "Home" },
  { href: "/datasets", label: "Spend histories", permission: "dataset:read" },
  { href: "/fits", label: "Fits", permission: "fit:read" },
  { href: "/scenarios", label: "Scenarios", permission: "scenario:read" },
  { href: "/compare", label: "Side by side", permission: "comparison:read" },
  { href: "/settings", label: "Settings" },
];

export default async function AppLayout({ children }: { children: ReactNode }) {
  const actor = await requirePageActor();
  const [workspaces, unread] = await Promise.all([listActorWorkspaces(actor), countUnreadNotifications({ workspaceId: actor.workspaceId, userId: actor.userId })]);
  const items = navigation.filter((item) => !item.permission || can(actor, item.permission)).map(({ href, label }) => ({ href, label }));
  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-10 focus:rounded focus:bg-white focus:px-3 focus:py-1 focus:text-river">
        Skip to content
      </a>
      <header className="bg-river text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3">
          <div className="flex items-baseline gap-3">
            <span className="text-xl font-semibold tracking-tight">Tributary</span>
            {workspaces.length > 1 ? (
              <form action={switchWorkspaceAction} className="flex items-center gap-1 text-sm">
                <label htmlFor="workspace-switch" className="sr-only">
                  Workspace
                </label>
                <select
                  id="workspace-switch"
                  name="workspace"
                  defaultValue={actor.workspaceSlug}
                  className="rounded border border-white/30 bg-river-light px-2 py-1 text-white"
                >
                  {workspaces.map((w) => (
                    <option key={w.workspaceId} value={w.workspaceSlug}>
                      {w.workspaceName}
                    </option>
                  ))}
                </select>
                <button type="submit" className="rounded px-2 py-1 text-white/90 underline-offset-2 hover:underline">
                  Switch
                </button>
              </form>
            ) : (
              <span className="text-sm text-white/80" data-testid="workspace-name">
                {actor.workspaceName}
              </span>
            )}
          </div>
          <div className="flex items-center gap-3 text-sm">
            <NotificationsLink initialUnread={unread} pollMs={UNREAD_POLL_MS} />
            <span className="text-right leading-tight">
              <span className="block font-medium" data-testid="signed-in-user">
                {actor.name ?? actor.email}
              </span>
              <span className="block text-xs text-white/75">{actor.roles.map((role) => roleLabels[role]).join(" · ")}</span>
            </span>
            <form action={signOutAction}>
              <button
                type="submit"
                className="rounded-md border border-white/40 px-3 py-1.5 font-medium hover:bg-white hover:text-river focus-visible:outline-2 focus-visible:outline-white"
              >
                Sign out
              </button>
            </form>
          </div>
        </div>
        <nav aria-label="Main" className="mx-auto max-w-6xl px-4 pb-2">
          <NavLinks items={items} />
        </nav>
      </header>
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-8">
        {children}
      </main>
    </div>
  );
}
