import { z } from "zod";
import { apiRoute } from "@/server/http/route";
import { listAuditEventsByWorkspaceId } from "@/server/data/audit";

const auditQuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50) });

/** The workspace's audit log, newest first. */
export const GET = apiRoute({ permission: "audit:read", query: auditQuerySchema }, async ({ actor, query }) => ({
  events: await listAuditEventsByWorkspaceId({ workspaceId: actor.workspaceId, limit: query.limit }),
}));
