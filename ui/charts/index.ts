// Generic visx charts shared by fit reports, spend histories and scenario screens.
export { CorrelationGrid, type CorrelationGridProps } from "./correlation-grid";
export { IntervalRow, intervalDomain, type IntervalRowProps } from "./interval-row";
export { chartColors } from "./palette";
export { ScatterPlot, type ScatterLine, type ScatterPlotProps, type ScatterPoint } from "./scatter-plot";
export { TimeSeriesChart, type TimeSeries, type TimeSeriesChartProps } from "./time-series-chart";
export { LeverageResidualsPlot, NormalQqPlot, ResidualsVsFittedPlot } from "./regression-diagnostics";
