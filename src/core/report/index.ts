/** Reports: batch entries and their CSV / JSON Lines rows, series analysis, SVG plots, HTML report. */
export { RESULT_COLUMNS, entryRow, metadataColumns, toCsv, toJsonLines, parseCsv } from './csv.js';
export type { BatchEntry, EntryStatus, ResultView, Cell, CsvRecord } from './csv.js';
export { analyseSeries, NO_NOTCH } from './series.js';
export type { SeriesAnalysis, SeriesGroup, NotchSeries, PowerLawFit } from './series.js';
export { histogramSvg, polarProfileSvg, seriesPlotSvg, niceTicks, escapeXml, fmt } from './svg.js';
export { buildReportHtml, CAUTION_TEXT } from './html.js';
export type { ReportInput } from './html.js';
