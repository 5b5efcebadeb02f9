import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Suspense } from "react";
import { z } from "zod";
import { can, requirePageActor } from "@/server/authz";
import { getPeopleByIds, isFrozenByFit, listDatasetAudit, listFitsOfDataset } from "@/server/datasets/details";
import { getCorrelationMatrix, getDatasetById, getDatasetRowsPage, loadDatasetFrame, type DatasetDto } from "@/server/datasets/store";
import { describeAuditEvent } from "@/ui/audit-event";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { CorrelationGrid, TimeSeriesChart } from "@/ui/charts";
import { ColumnProfile } from "@/ui/datasets/column-profile";
import { formatBytes } from "@/ui/datasets/format";
import { RowsTable } from "@/ui/datasets/rows-table";
import { DatasetStatusBadge } from "@/ui/datasets/status";
import { formatCompact, formatDateTime, shortPeriod } from "@/ui/fits/format";
import { FitStatusBadge } from "@/ui/fits/status";
import { Section } from "@/ui/section";
import type { FitStatus } from "@/server/fits/types";
import { Breadcrumb } from "@/ui/breadcrumb";
import { describeCoverage, periodCoverage } from "@/server/datasets/period-coverage";

export const metadata: Metadata = { title: "Spend history" };

const ROWS_PER_PAGE = 50;
/** The outcome plot draws at most this many points; longer histories are averaged in equal buckets. */
const MAX_PLOT_POINTS = 600;

type Props = { params: Promise<{ id: string }>; searchParams: Promise<{ page?: string | string[] }> };

const delimiterNames: Record<string, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };

export default async function SpendHistoryPage({ params, searchParams }: Props) {
  const actor = await requirePageActor("dataset:read");
  const { id } = await params;
  if (!z.uuid().safeParse(id).success) notFound();
  const dataset = await getDatasetById({ workspaceId: actor.workspaceId, datasetId: id });
  if (!dataset) notFound();
  const query = await searchParams;
  const pages = Math.max(1, Math.ceil(dataset.rowCount / ROWS_PER_PAGE));
  const requested = Number(typeof query.page === "string" ? query.page : 1);
  const page = Number.isInteger(requested) ? Math.min(Math.max(requested, 1), pages) : 1;

  const [people, fits, audit, rows] = await Promise.all([
    getPeopleByIds([dataset.uploadedBy, dataset.rolesAssignedBy]),
    listFitsOfDataset({ workspaceId: actor.workspaceId, datasetId: dataset.id }),
    listDatasetAudit({ workspaceId: actor.workspaceId, datasetId: dataset.id }),
    getDatasetRowsPage({ workspaceId: actor.workspaceId, datasetId: dataset.id, offset: (page - 1) * ROWS_PER_PAGE, limit: ROWS_PER_PAGE }),
  ]);
  const locale = actor.locale;
  const uploader = dataset.uploadedBy ? people[dataset.uploadedBy]?.name : null;
  const assigner = dataset.rolesAssignedBy ? people[dataset.rolesAssignedBy]?.name : null;
  const frozen = isFrozenByFit(fits);
  const canChooseRoles = can(actor, "dataset:upload") && !frozen;
  const outcome = dataset.columns.find((c) => c.role === "outcome") ?? null;

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <Breadcrumb trail={[{ href: "/datasets", label: "Spend histories" }]} />
          <h1 className="mt-1 flex flex-wrap items-center gap-3 text-2xl font-semibold text-river">
            <span data-testid="dataset-name">{dataset.name}</span> <DatasetStatusBadge status={dataset.status} />
          </h1>
          <p className="mt-1 text-sm text-slate-700">
            {dataset.rowCount.toLocaleString(locale)} rows × {dataset.columnCount} columns · uploaded by {uploader ?? "—"} on{" "}
            {formatDateTime(dataset.uploadedAt, locale)}
            {dataset.rolesAssignedAt ? ` · roles chosen by ${assigner ?? "—"} on ${formatDateTime(dataset.rolesAssignedAt, locale)}` : ""}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {dataset.status === "ready" && can(actor, "fit:create") ? (
            <Link href="/fits/new" className={buttonClass("primary")}>
              Build a fit
            </Link>
          ) : null}
          {canChooseRoles ? (
            <Link href={`/datasets/${dataset.id}/roles`} className={buttonClass(dataset.status === "ready" ? "secondary" : "primary")}>
              {dataset.status === "ready" ? "Change roles" : "Choose column roles"}
            </Link>
          ) : null}
        </div>
      </div>

      {dataset.status === "needs-roles" ? (
        <p className="rounded-md border-l-4 border-ember bg-white px-4 py-3 text-sm text-slate-800 shadow-sm" data-testid="needs-roles">
          <strong>Roles not chosen yet.</strong> Fits need to know which column is the outcome, which are spend channels and controls, and which is the period.{" "}
          {canChooseRoles ? (
            <Link href={`/datasets/${dataset.id}/roles`} className="font-medium text-shallows underline underline-offset-2">
              Choose them now
            </Link>
          ) : (
            "An analyst chooses them."
          )}
        </p>
      ) : null}

      <Section id="file" title="The original file" description="Kept byte for byte for audit; the sha256 identifies it exactly.">
        <dl className="grid grid-cols-1 gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
          <dt className="text-slate-600">File</dt>
          <dd className="break-all">
            {dataset.originalFilename} · {formatBytes(dataset.byteSize, locale)} ({dataset.byteSize.toLocaleString(locale)} bytes) · {delimiterNames[dataset.delimiter] ?? dataset.delimiter}
            -separated · {dataset.lineEnding.toUpperCase()} line endings{dataset.hasBom ? " · with a byte order mark" : ""}
          </dd>
          <dt className="text-slate-600">sha256</dt>
          <dd className="break-all font-mono text-xs leading-5" data-testid="dataset-sha256">
            {dataset.sha256}
          </dd>
          <dt className="text-slate-600">Uploaded</dt>
          <dd>
            by {uploader ?? "—"} on {formatDateTime(dataset.uploadedAt, locale)}
          </dd>
          <dt className="text-slate-600">Missing values</dt>
          <dd>
            {dataset.missingPolicy === "reject"
              ? "Rejected: every used column is complete."
              : `Incomplete rows left out of fits: ${dataset.droppedRowCount.toLocaleString(locale)} of ${dataset.rowCount.toLocaleString(locale)} (they stay stored).`}
          </dd>
        </dl>
        <div className="mt-4 flex flex-wrap gap-2">
          <a href={`/api/datasets/${dataset.id}/file`} className={buttonClass("secondary")} download>
            Download the original file
          </a>
          <a href={`/api/datasets/${dataset.id}/export`} className={buttonClass("secondary")} download>
            Export rows as CSV
          </a>
        </div>
        <p className="mt-2 text-xs text-slate-600">
          In the export, cells that a spreadsheet would run as a formula (starting with =, +, −, @) are written as text.
        </p>
      </Section>

      {outcome ? (
        <Section id="outcome" title="Outcome over time" description={`${outcome.name}${outcome.unit ? ` (${outcome.unit})` : ""} by period, as used in fits.`}>
          <Suspense fallback={<p className="text-sm text-slate-600">Drawing the outcome…</p>}>
            <OutcomeOverTime dataset={dataset} outcomeName={outcome.name} unit={outcome.unit} locale={locale} />
          </Suspense>
        </Section>
      ) : null}

      <Section id="profile" title="Column profile" description="Over every stored row; missing counts empty cells (and NA, null…).">
        <ColumnProfile columns={dataset.columns} locale={locale} rowCount={dataset.rowCount} />
      </Section>

      <Section
        id="correlations"
        title="Correlations of the candidate predictors"
        description={
          dataset.status === "ready"
            ? "Pearson correlation between spend channels and controls over the rows a fit uses. Strongly correlated predictors make their separate effects hard to tell apart."
            : "Pearson correlation between the numeric columns (before roles are chosen)."
        }
      >
        <Suspense fallback={<p className="text-sm text-slate-600">Computing correlations…</p>}>
          <Correlations workspaceId={actor.workspaceId} datasetId={dataset.id} locale={locale} />
        </Suspense>
      </Section>

      <Section id="rows" title="Rows" description="As stored, in file order; empty cells show as —.">
        {rows ? <RowsTable page={rows} locale={locale} hrefFor={(n) => `/datasets/${dataset.id}?page=${n}#rows`} /> : null}
      </Section>

      {fits.length > 0 ? (
        <Section id="fits" title="Fits on this spend history" description={frozen ? "An approved fit uses it, so its data and roles are frozen." : undefined}>
          <ul className="flex flex-col gap-1 text-sm">
            {fits.map((fit) => (
              <li key={fit.id} className="flex flex-wrap items-center gap-2">
                <Link href={`/fits/${fit.id}`} className={`font-medium ${textLinkClass}`}>
                  {fit.name}
                </Link>
                <FitStatusBadge status={fit.status as FitStatus} />
              </li>
            ))}
          </ul>
        </Section>
      ) : null}

      <Section id="history" title="History">
        {audit.length === 0 ? (
          <p className="text-sm text-slate-600">Uploaded by {uploader ?? "—"} on {formatDateTime(dataset.uploadedAt, locale)} (before the audit log recorded uploads).</p>
        ) : (
          <ol className="flex flex-col gap-1 text-sm" data-testid="dataset-history">
            {audit.map((entry, index) => (
              <li key={index}>
                <span className="text-slate-600">{formatDateTime(entry.at, locale)}</span> · <span className="font-medium">{entry.actorName ?? "Someone"}</span>{" "}
                {describeAuditEvent({ action: entry.action, details: entry.details, objectType: "dataset" })}
              </li>
            ))}
          </ol>
        )}
      </Section>
    </div>
  );
}

/** The outcome in period order (file order without a period), averaged into buckets when long. */
async function OutcomeOverTime({ dataset, outcomeName, unit, locale }: { dataset: DatasetDto; outcomeName: string; unit: string | null; locale: string }) {
  const frame = await loadDatasetFrame(dataset.id, { workspaceId: dataset.workspaceId, columns: [outcomeName] });
  if (!frame || frame.n === 0) return <p className="text-sm text-slate-600">No complete rows to draw.</p>;
  const values = frame.columns[outcomeName];
  const labelOf = (i: number) => (frame.periods ? frame.periods[i] : `row ${frame.rowNumbers[i]}`);
  const bucket = Math.ceil(frame.n / MAX_PLOT_POINTS);
  const coverage = frame.periods ? periodCoverage(frame.periods) : null;
  const labels: string[] = [];
  const points: number[] = [];
  for (let start = 0; start < frame.n; start += bucket) {
    const end = Math.min(frame.n, start + bucket);
    let sum = 0;
    for (let i = start; i < end; i++) sum += values[i];
    labels.push(labelOf(start));
    points.push(sum / (end - start));
  }
  return (
    <div data-testid="outcome-plot">
      <TimeSeriesChart
        title={outcomeName}
        labels={labels}
        series={[{ name: bucket > 1 ? `${outcomeName} (mean of each ${bucket} periods)` : outcomeName, values: points }]}
        yLabel={unit ? `${outcomeName} (${unit})` : outcomeName}
        xLabel={frame.periods ? "Period" : "Row (no period column)"}
        formatY={(v) => formatCompact(v, unit, locale)}
        formatLabel={(label) => shortPeriod(label, locale)}
        footer={`${frame.n.toLocaleString(locale)} periods${frame.periods ? ` from ${frame.periods[0]} to ${frame.periods[frame.n - 1]}` : ""}.`}
      />
      {coverage ? (
        <p
          data-testid="period-coverage"
          data-gaps={coverage.gaps.length}
          className={`mt-2 text-sm ${coverage.gaps.length > 0 ? "rounded-md border-l-4 border-ember bg-white px-3 py-2 text-slate-900" : "text-slate-700"}`}
        >
          {describeCoverage(coverage)}
        </p>
      ) : null}
    </div>
  );
}

async function Correlations({ workspaceId, datasetId, locale }: { workspaceId: string; datasetId: string; locale: string }) {
  const matrix = await getCorrelationMatrix({ workspaceId, datasetId });
  if (!matrix || matrix.columns.length < 2) {
    return <p className="text-sm text-slate-600">There are fewer than two candidate predictors, so there is nothing to correlate.</p>;
  }
  return (
    <div data-testid="correlation-grid">
      <CorrelationGrid
        labels={matrix.columns.map((c) => c.name)}
        values={matrix.matrix.map((row) => row.map((r) => (r === null ? Number.NaN : r)))}
        caption={`Over ${matrix.n.toLocaleString(locale)} complete rows.`}
      />
    </div>
  );
}
