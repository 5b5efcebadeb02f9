// Roles and what each may do. Plain data with no imports from server code, so client components
// (navigation, disabled buttons) can read it too — but a hidden button is never the check:
// every entry point calls requirePermission (server/authz/actor.ts).
import type { Role } from "@/db/schema/workspaces";

export type { Role };

/** Every role, in display order (the schema's check constraint lists the same five). */
export const roleNames = ["admin", "analyst", "reviewer", "planner", "finance"] as const satisfies readonly Role[];
// Fails to compile if the schema gains a role that is missing above.
const everyRoleListed: Exclude<Role, (typeof roleNames)[number]> extends never ? true : false = true;
void everyRoleListed;

export const permissions = [
  "workspace:read", // see the workspace, its members' names, the home page
  "workspace:admin", // invite, change roles, remove members, set currency
  "mail:outbox", // the local mail outbox (only exists when MAIL_SINK=local)
  "audit:read", // the workspace's audit log
  "token:manage", // one's own API tokens
  "dataset:read",
  "dataset:upload",
  "fit:read",
  "fit:create", // build and fit models, edit own drafts
  "fit:submit", // send a draft for review
  "fit:review", // approve or request changes (never on a fit one built)
  "fit:retire",
  "fit:predict", // run predictions / suggestions on an approved fit
  "scenario:read",
  "scenario:write", // create scenarios and save versions
  "scenario:share",
  "comparison:read",
  "comparison:write",
  "comment:write",
  "signoff:decide", // sign off or decline a scenario version
] as const;

export type Permission = (typeof permissions)[number];

const everyMember: Permission[] = ["workspace:read", "token:manage"];

/** The compiler makes sure every role is listed; a member's permissions are the union over their roles. */
export const permissionsByRole: Record<Role, readonly Permission[]> = {
  admin: [...everyMember, "workspace:admin", "mail:outbox", "audit:read", "dataset:read", "fit:read", "scenario:read", "comparison:read"],
  analyst: [...everyMember, "dataset:read", "dataset:upload", "fit:read", "fit:create", "fit:submit", "fit:retire", "fit:predict"],
  reviewer: [...everyMember, "dataset:read", "fit:read", "fit:review", "fit:retire", "fit:predict", "audit:read", "scenario:read"],
  planner: [
    ...everyMember,
    "fit:read",
    "fit:predict",
    "scenario:read",
    "scenario:write",
    "scenario:share",
    "comparison:read",
    "comparison:write",
    "comment:write",
  ],
  finance: [...everyMember, "fit:read", "scenario:read", "comparison:read", "comparison:write", "comment:write", "signoff:decide"],
};

export const roleLabels: Record<Role, string> = {
  admin: "Admin",
  analyst: "Analyst",
  reviewer: "Reviewer",
  planner: "Planner",
  finance: "Finance",
};

export const roleDescriptions: Record<Role, string> = {
  admin: "Manages members, roles, invitations and workspace settings.",
  analyst: "Uploads spend histories, builds fits and sends them for review.",
  reviewer: "Approves fits or requests changes; never on a fit they built.",
  planner: "Moves budget between channels on approved fits and saves scenario versions.",
  finance: "Compares scenario versions side by side and signs off or declines.",
};

export function permissionsOf(roles: readonly Role[]): Set<Permission> {
  const result = new Set<Permission>();
  for (const role of roles) for (const permission of permissionsByRole[role]) result.add(permission);
  return result;
}

export function rolesAllow(roles: readonly Role[], permission: Permission): boolean {
  return roles.some((role) => permissionsByRole[role].includes(permission));
}

export const isRole = (value: unknown): value is Role => typeof value === "string" && (roleNames as readonly string[]).includes(value);
