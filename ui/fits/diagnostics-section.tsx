import { LeverageResidualsPlot, NormalQqPlot, ResidualsVsFittedPlot, TimeSeriesChart, chartColors } from "@/ui/charts";
import type { FitReport } from "@/server/fits/types";
import { formatCompact, shortPeriod, unitLabel } from "./format";

export function DiagnosticsSection({ report, locale }: { report: FitReport; locale: string }) {
  const { points, qq, series, sampled, total } = report.diagnostics;
  const unit = report.units[report.outcome] ?? null;
  const rowLabels = points.row.map((row) => `Row ${row}`);
  const money = (value: number) => formatCompact(value, unit, locale);
  return (
    <div className="space-y-6">
      {sampled ? (
        <p className="text-sm text-slate-700">
          The scatter plots show {points.row.length.toLocaleString(locale)} of {total.toLocaleString(locale)} rows: every row with an extreme residual,
          leverage or Cook&apos;s distance, plus an even sample of the rest. Every statistic on this page uses all rows.
        </p>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-2">
        <ResidualsVsFittedPlot
          fitted={points.fitted}
          residuals={points.residual}
          standardized={points.standardized}
          rowLabels={rowLabels}
          formatValue={money}
          unitLabel={unitLabel(unit)}
        />
        <NormalQqPlot theoretical={qq.theoretical} sample={qq.sample} />
        <LeverageResidualsPlot
          leverage={points.leverage}
          standardized={points.standardized}
          cooks={points.cooks}
          rowLabels={rowLabels}
          parameterCount={report.rank}
        />
      </div>
      <TimeSeriesChart
        title={`${report.outcome} and fitted values over time`}
        labels={series.label}
        series={[
          { name: `${report.outcome} (observed)`, values: series.outcome, color: chartColors.river },
          { name: "Fitted", values: series.fitted, color: chartColors.ember, dashed: true },
        ]}
        yLabel={`${report.outcome} (${unitLabel(unit)})`}
        xLabel={report.periodColumn ?? "Row"}
        formatY={money}
        formatLabel={(label) => shortPeriod(label, locale)}
        footer={
          series.rowsPerPoint > 1
            ? `Each point is the mean of ${series.rowsPerPoint.toLocaleString(locale)} consecutive rows.`
            : "Gaps between the lines are the residuals; runs on one side suggest something the model does not see (season, trend)."
        }
      />
    </div>
  );
}
