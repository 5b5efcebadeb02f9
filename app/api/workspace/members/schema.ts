import { z } from "zod";
import { roleNames } from "@/server/authz/roles";

export const rolesSchema = z
  .array(z.enum(roleNames), "Give roles as a list, e.g. [\"analyst\"].")
  .min(1, "Choose at least one role.")
  .transform((roles) => [...new Set(roles)]);

export const changeRolesRequestSchema = z.object({ roles: rolesSchema }).strict();
export type ChangeRolesRequest = z.input<typeof changeRolesRequestSchema>;

export const memberParams = z.object({ userId: z.string().min(1).max(100) });
