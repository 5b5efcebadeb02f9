// The authorization API: import from "@/server/authz" in pages, server actions and route handlers.
export { requireActor, getOptionalActor, requirePermission, assertInWorkspace, can, listActorWorkspaces, WORKSPACE_COOKIE, setWorkspaceCookie, requestIsHttps, type Actor } from "./actor";
export { requirePageActor } from "./page";
export { permissionsByRole, permissionsOf, rolesAllow, roleNames, roleLabels, roleDescriptions, type Permission, type Role } from "./roles";
