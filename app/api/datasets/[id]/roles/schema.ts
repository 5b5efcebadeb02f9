export { assignRolesSchema as assignRolesRequestSchema } from "@/server/datasets/roles";
