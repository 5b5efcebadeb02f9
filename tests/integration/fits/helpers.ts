// Fixtures for the fit integration tests: a fresh workspace with people per test, the demo history
// uploaded through the datasets engine, API tokens, route handlers called as Next calls them, and an
// in-process SMTP server standing in for the mail sink.
import { Readable } from "node:stream";
import { SMTPServer } from "smtp-server";
import type { AddressInfo } from "node:net";
import { getDatabase } from "@/db/client";
import type { Role } from "@/db/schema";
import { createApiToken } from "@/server/data/api-tokens";
import { assignDatasetRoles, createDataset } from "@/server/datasets/store";
import { demoChannels, demoControl, demoHistoryCsv, demoOutcome, demoPeriod, generateDemoHistory } from "@/seed/history";
import { apiRequest, makeWorkspace, routeContext } from "../auth/helpers";

export { apiRequest, routeContext };

export const sql = () => getDatabase().sql;

/** A workspace with the given people (name → roles), each with an API token. */
export async function makeTeam<T extends Record<string, Role[]>>(people: T) {
  const { workspace, members } = await makeWorkspace(people);
  const tokens = {} as Record<keyof T, string>;
  for (const name of Object.keys(people) as (keyof T & string)[]) {
    tokens[name] = (await createApiToken({ workspaceId: workspace.id, userId: members[name].id, name: "fits", expiresAt: null })).token;
  }
  return { workspace, members: members as Record<keyof T & string, (typeof members)[string]>, tokens };
}

/** Uploads a CSV and assigns its roles (the two steps of the upload page); returns the dataset id. */
export async function uploadDataset(input: {
  workspaceId: string;
  userId: string;
  csv: string;
  roles: Record<string, { role: "outcome" | "spend" | "control" | "period"; unit?: string }>;
  name?: string;
}): Promise<string> {
  const upload = await createDataset({
    workspaceId: input.workspaceId,
    userId: input.userId,
    name: input.name ?? "Test history",
    originalFilename: "history.csv",
    stream: Readable.from([Buffer.from(input.csv, "utf8")]),
  });
  if (!upload.ok) throw new Error(`upload refused: ${JSON.stringify(upload.report.problems.slice(0, 3))}`);
  const assigned = await assignDatasetRoles({ workspaceId: input.workspaceId, datasetId: upload.dataset.id, userId: input.userId, roles: input.roles });
  if (!assigned?.ok) throw new Error(`roles refused: ${JSON.stringify(assigned?.report.problems.slice(0, 3))}`);
  return upload.dataset.id;
}

export const demoRoles = () => {
  const roles: Record<string, { role: "outcome" | "spend" | "control" | "period"; unit?: string }> = {
    [demoPeriod.column]: { role: "period" },
    [demoOutcome.column]: { role: "outcome", unit: "EUR" },
    [demoControl.column]: { role: "control", unit: "weeks" },
  };
  for (const channel of demoChannels) roles[channel.column] = { role: "spend", unit: "EUR" };
  return roles;
};

export const uploadDemoDataset = (workspaceId: string, userId: string) =>
  uploadDataset({ workspaceId, userId, csv: demoHistoryCsv(), roles: demoRoles(), name: "Larkspur weekly (test)" });

/** The demo history's numeric columns, as the engine sees them (rows are already in week order). */
export function demoColumns(): Record<string, number[]> {
  const rows = generateDemoHistory();
  const columns: Record<string, number[]> = {};
  for (const column of [...demoChannels.map((c) => c.column), demoControl.column, demoOutcome.column]) {
    columns[column] = rows.map((row) => row[column as keyof typeof row] as number);
  }
  return columns;
}

export const demoRequest = (datasetId: string, extra: Record<string, unknown> = {}) => ({
  datasetId,
  outcome: demoOutcome.column,
  terms: demoChannels.map((c) => c.column),
  controls: [demoControl.column],
  ...extra,
});

export type SinkMessage = { from: string; to: string[]; raw: string };

/**
 * An SMTP server on a free port that keeps every message; points the app's mail transport at it
 * (SMTP_HOST/SMTP_PORT are read when the transport is first built, so the cached one is dropped).
 */
export async function startMailSink(): Promise<{ messages: SinkMessage[]; stop: () => Promise<void>; waitFor: (predicate: (m: SinkMessage) => boolean, timeoutMs?: number) => Promise<SinkMessage> }> {
  const messages: SinkMessage[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("end", () => {
        messages.push({
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
          raw: Buffer.concat(chunks).toString("utf8"),
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const port = (server.server.address() as AddressInfo).port;
  process.env.SMTP_HOST = "127.0.0.1";
  process.env.SMTP_PORT = String(port);
  delete process.env.SMTP_USER;
  delete (globalThis as { tributaryMailer?: unknown }).tributaryMailer;
  return {
    messages,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
    async waitFor(predicate, timeoutMs = 5_000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const found = messages.find(predicate);
        if (found) return found;
        if (Date.now() > deadline) throw new Error(`no matching mail among ${messages.length}: ${messages.map((m) => m.raw.match(/^Subject: (.*)$/m)?.[1]).join(" | ")}`);
        await new Promise((resolve) => setTimeout(resolve, 50));
      }
    },
  };
}

export const subjectOf = (message: SinkMessage) => message.raw.match(/^Subject: (.*)$/m)?.[1]?.trim() ?? "";
