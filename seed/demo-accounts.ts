// The demo company's workspaces and people. Plain data (no server imports) so tests can read it too.
// README.md lists the same sign-ins under "Demo sign-ins".
import type { Role } from "@/db/schema/workspaces";

export type DemoAccount = { email: string; name: string; password: string; roles: Role[]; workspace: string };

export const demoWorkspaces = [
  // An invented outdoor-gear retailer selling online and in shops across the Benelux.
  { slug: "larkspur", name: "Larkspur Outfitters", currency: "EUR", locale: "en-IE" },
  // A second company, only there to prove that one workspace never sees another's data.
  { slug: "foreign", name: "Foreign", currency: "GBP", locale: "en-GB" },
] as const;

export const demoAccounts = [
  { email: "admin@larkspur.example", name: "Maren Holt", password: "larkspur-admin", roles: ["admin"], workspace: "larkspur" },
  { email: "analyst@larkspur.example", name: "Tobias Reyes", password: "larkspur-analyst", roles: ["analyst"], workspace: "larkspur" },
  { email: "reviewer@larkspur.example", name: "Ingrid Solberg", password: "larkspur-reviewer", roles: ["reviewer"], workspace: "larkspur" },
  { email: "planner@larkspur.example", name: "Priya Nair", password: "larkspur-planner", roles: ["planner"], workspace: "larkspur" },
  { email: "finance@larkspur.example", name: "Felix Brandt", password: "larkspur-finance", roles: ["finance"], workspace: "larkspur" },
  { email: "sam@larkspur.example", name: "Sam Okafor", password: "larkspur-sam", roles: ["analyst", "planner"], workspace: "larkspur" },
  {
    email: "owner@foreign.example",
    name: "Rui Costa",
    password: "foreign-owner",
    roles: ["admin", "analyst", "reviewer", "planner", "finance"],
    workspace: "foreign",
  },
] as const satisfies readonly DemoAccount[];

/** The demo account holding exactly `role` in Larkspur Outfitters. */
export const demoAccountFor = (role: Role) =>
  demoAccounts.find((account) => account.workspace === "larkspur" && account.roles.length === 1 && account.roles[0] === role)!;
