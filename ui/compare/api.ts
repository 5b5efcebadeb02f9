// Browser calls of the side-by-side API (same-origin, session cookie); errors carry the standard body.
import { ApiError } from "@/ui/scenario/api";

export { ApiError };

async function send<T>(url: string, init?: RequestInit): Promise<T> {
  const response = await fetch(url, { ...init, headers: { "content-type": "application/json", ...(init?.headers ?? {}) } });
  const body = (await response.json().catch(() => ({}))) as T & { error?: string; details?: Record<string, unknown>[] };
  if (!response.ok) throw new ApiError(body.error ?? `The request failed (${response.status}).`, response.status, body.details ?? []);
  return body;
}

const post = <T>(url: string, body: unknown) => send<T>(url, { method: "POST", body: JSON.stringify(body) });
const versionUrl = (scenarioId: string, version: number, tail: string) => `/api/scenarios/${scenarioId}/versions/${version}/${tail}`;

export type ShareBody = { recipients: string[]; note?: string; acknowledgement?: string | null };

export const reviewApi = {
  saveComparison: (body: { name: string; versions: { scenarioId: string; version: number }[]; baseline: number }) => post<{ id: string }>("/api/comparisons", body),
  shareComparison: (id: string, body: ShareBody) => post<{ id: string; mailedTo: string[] }>(`/api/comparisons/${id}/share`, body),
  shareVersion: (scenarioId: string, version: number, body: ShareBody) => post<{ id: string; mailedTo: string[] }>(versionUrl(scenarioId, version, "share"), body),
  comment: (scenarioId: string, version: number, body: { body: string; parentId?: string | null; comparisonId?: string | null }) =>
    post<{ id: string }>(versionUrl(scenarioId, version, "comments"), body),
  decide: (scenarioId: string, version: number, body: { decision: "signed_off" | "declined"; reason?: string }) => post<{ id: string }>(versionUrl(scenarioId, version, "signoff"), body),
  markRead: (body: { ids?: string[]; all?: boolean }) => post<{ marked: number; unread: number }>("/api/notifications/read", body),
};

/** A readable message for a failed call: the error sentence plus the first detail when it adds something. */
export function problemText(error: unknown): string {
  if (error instanceof ApiError) {
    const detail = error.details.find((item) => typeof item.message === "string" && item.message !== error.message);
    return detail && error.message === "The request body is not valid." ? String(detail.message) : error.message;
  }
  return error instanceof Error ? error.message : String(error);
}
