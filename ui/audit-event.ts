import type { AuditEventDto } from "@/server/data/audit";

const str = (value: unknown) => (typeof value === "string" ? value : "");
const list = (value: unknown) => (Array.isArray(value) ? value.map(String).join(", ") : "");

/**
 * A short phrase for an audit entry ("invited ana@… as analyst"). Features add their actions here;
 * unknown actions fall back to the action name.
 */
export function describeAuditEvent(event: Pick<AuditEventDto, "action" | "details" | "objectType"> & { subjectName?: string | null }): string {
  const d = event.details ?? {};
  switch (event.action) {
    case "member.invited":
      return `invited ${str(d.email)} as ${list(d.roles)}`;
    case "member.joined":
      return `joined as ${list(d.roles)}`;
    case "member.roles_changed":
      return `changed ${event.subjectName ? `${event.subjectName}'s` : "a member's"} roles from ${list(d.before)} to ${list(d.after)}`;
    case "member.removed":
      return `removed ${event.subjectName ?? "a member"} from the workspace`;
    case "invitation.revoked":
      return `withdrew the invitation to ${str(d.email)}`;
    case "api_token.created":
      return `created an API token (${str(d.prefix)}…)`;
    case "api_token.revoked":
      return `revoked an API token (${str(d.prefix)}…)`;
    case "workspace.created":
      return "created the workspace";
    case "workspace.settings_changed":
      return "changed the workspace settings";
    case "fit.created":
      return `built the fit “${str(d.name)}”`;
    case "fit.refitted":
      return `refitted the fit “${str(d.name)}”`;
    case "fit.submitted":
      return `sent the fit “${str(d.name)}” for review`;
    case "fit.approved":
      return `approved the fit “${str(d.name)}”`;
    case "fit.changes_requested":
      return `requested changes to the fit “${str(d.name)}”`;
    case "fit.retired":
      return `retired the fit “${str(d.name)}”`;
    case "dataset.uploaded":
      return `uploaded the spend history “${str(d.name)}” (${typeof d.rows === "number" ? d.rows.toLocaleString("en") : "?"} rows, ${str(d.filename)})`;
    case "dataset.roles_assigned":
      return `chose the column roles of “${str(d.name)}” (outcome ${str(d.outcome) || "—"}, ${Array.isArray(d.spend) ? d.spend.length : 0} spend channels${typeof d.droppedRows === "number" && d.droppedRows > 0 ? `, ${d.droppedRows} incomplete rows left out` : ""})`;
    case "scenario.created":
      return `started the scenario “${str(d.name)}”`;
    case "scenario.version_saved": {
      // Entries from before the name was recorded say "a scenario".
      const scenario = str(d.name) ? `“${str(d.name)}”` : "a scenario";
      const restored = typeof d.restoredFrom === "number" ? `, restored from version ${d.restoredFrom}` : "";
      const warned = Array.isArray(d.warnings) && d.warnings.length > 0 ? " (with extrapolation warnings)" : "";
      return `saved version ${String(d.number ?? "?")} of ${scenario}${restored}${warned}`;
    }
    case "comparison.created":
      return `saved the comparison “${str(d.name)}”`;
    case "share.created":
      return `shared ${event.objectType === "comparison" ? `the comparison “${str(d.name)}”` : `“${str(d.name)}” version ${String(d.version ?? "?")}`} with ${list(d.recipientNames ?? d.recipients)}${d.acknowledgement ? " (warnings acknowledged)" : ""}`;
    case "comment.posted":
      return `commented on “${str(d.name)}” version ${String(d.version ?? "?")}`;
    case "comment.replied":
      return `replied to a comment on “${str(d.name)}” version ${String(d.version ?? "?")}`;
    case "signoff.signed_off":
      return `signed off “${str(d.name)}” version ${String(d.version ?? "?")}`;
    case "signoff.declined":
      return `declined “${str(d.name)}” version ${String(d.version ?? "?")}: ${str(d.reason)}`;
    default:
      return `${event.action.replace(/[._]/g, " ")}`;
  }
}
