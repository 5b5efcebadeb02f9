import { apiRoute } from "@/server/http/route";
import { listMembersByWorkspaceId } from "@/server/data/members";

/** Members of the workspace with their roles (admins). */
export const GET = apiRoute({ permission: "workspace:admin" }, async ({ actor }) => ({
  members: await listMembersByWorkspaceId(actor.workspaceId),
}));
