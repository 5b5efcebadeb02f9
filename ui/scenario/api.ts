import type { ScenarioDto, VersionDto, VersionSummaryDto } from "@/server/scenarios/types";

/** An API error with the standard body ({error, details}). */
export class ApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly details: Record<string, unknown>[],
  ) {
    super(message);
  }
}

async function send<T>(url: string, init?: RequestInit): Promise<T> {
  const response = await fetch(url, { ...init, headers: { "content-type": "application/json", ...(init?.headers ?? {}) } });
  const body = (await response.json().catch(() => ({}))) as T & { error?: string; details?: Record<string, unknown>[] };
  if (!response.ok) throw new ApiError(body.error ?? `The request failed (${response.status}).`, response.status, body.details ?? []);
  return body;
}

export const scenarioApi = {
  get: (id: string) => send<ScenarioDto>(`/api/scenarios/${id}`),
  versions: (id: string) => send<{ versions: VersionSummaryDto[] }>(`/api/scenarios/${id}/versions`).then((body) => body.versions),
  version: (id: string, number: number) => send<VersionDto>(`/api/scenarios/${id}/versions/${number}`),
  save: (id: string, body: Record<string, unknown>) => send<VersionDto>(`/api/scenarios/${id}/versions`, { method: "POST", body: JSON.stringify(body) }),
  start: (body: Record<string, unknown>) => send<ScenarioDto>(`/api/scenarios`, { method: "POST", body: JSON.stringify(body) }),
};
