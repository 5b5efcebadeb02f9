import "server-only";
import { forbidden, redirect } from "next/navigation";
import { headers } from "next/headers";
import { AppError } from "@/server/errors";
import { can, requireActor, type Actor } from "@/server/authz/actor";
import type { Permission } from "@/server/authz/roles";

/**
 * requireActor for pages (server components): not signed in → redirect to /login (back here after);
 * no workspace → /no-workspace; missing permission → the 403 page (app/forbidden.tsx).
 */
export async function requirePageActor(permission?: Permission): Promise<Actor> {
  let actor: Actor;
  try {
    actor = await requireActor();
  } catch (error) {
    if (error instanceof AppError && error.type === "unauthenticated") {
      const path = (await headers()).get("x-tributary-path") ?? "/";
      redirect(`/login?callbackUrl=${encodeURIComponent(path)}`);
    }
    if (error instanceof AppError && error.code === "forbidden:no_workspace") redirect("/no-workspace");
    throw error;
  }
  if (permission && !can(actor, permission)) forbidden();
  return actor;
}
