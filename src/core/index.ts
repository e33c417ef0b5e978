/**
 * fractozone core: the public API the shells (command line, batch workers, web app worker) use.
 * Everything here is pure, deterministic and typed (no file system, no DOM, no `process`); the
 * folders behind it are free to change as long as these names keep their meaning.
 *
 * - Measure an image: `analyseImage` / `analyseDecoded` with a `MeasureParams` (from
 *   `defaultParams()`), giving a `MeasureResult` (schema `RESULT_SCHEMA`) and an overlay picture;
 *   `remeasure` re-runs the measurement of a result with an edited boundary or other parameters;
 *   `recompute` applies any later input (scale, corrected outline, boundary, material, …) to a full
 *   run's result from its stored geometry, or says why only a full run can give the numbers.
 * - Show a result: `summarise` (the labelled figures every view formats), `entryRow` / `toCsv`
 *   (tables), `buildReportHtml` (batch report), `buildImageReportHtml` (one image),
 *   `resultOverlay` / `encodeOverlayPng` (overlay pictures).
 * - Take work up again: `makeSession` / `sessionText` / `parseSession` (`SESSION_SCHEMA`).
 * - The engineering caution every view carries: `CAUTION`.
 */

// Measurement pipeline and its result
export {
  analyseImage,
  analyseDecoded,
  remeasure,
  defaultParams,
  validateParams,
  canonicalJson,
  encodeOverlayPng,
  WorkingFrame,
  WORKING_LONG_SIDE_PX,
  RESULT_SCHEMA,
} from './pipeline/index.js';
export type {
  Analysis,
  InputInfo,
  ProgressFn,
  MeasureParams,
  ScaleParams,
  MaterialParams,
  MeasureResult,
  BoundarySource,
  ResultTool,
  ResultInput,
  ImageFacts,
  ResolvedSettings,
  ResultScale,
  DetectedBar,
  ResultSpecimen,
  ResultSpecimenRecord,
  ResultHalves,
  CircleSummary,
  EllipseSummary,
  ResultBand,
  ResultBoundary,
  WidthSummary,
  NormalWidthSummary,
  RayResult,
  SeparabilitySummary,
  Comparison,
  Diagnostics,
  Quality,
  QualityVerdict,
} from './pipeline/index.js';
export { judgeQuality, assessQuality, QUALITY_RULES, type QualityRule } from './pipeline/stages/quality.js';
export { recompute, fullRunReason, rescaleResult, withOutline, scaleFor, OUTLINE_CORRECTED, type RecomputeOutcome } from './pipeline/recompute.js';
export { SESSION_SCHEMA, makeSession, sessionText, parseSession, type Session, type SessionModel } from './session.js';
export { CAUTION } from './caution.js';
export {
  WARNINGS,
  WARNING_CODES,
  warn,
  severityOf,
  mergeWarnings,
  type Warning,
  type WarningCode,
  type WarningDefinition,
  type Severity,
} from './warnings.js';

// Errors
export { FractozoneError, isFractozoneError, type ErrorCode, type ErrorKind } from './errors.js';

// OpenCV runtime (loaded by the shells)
export { setCv, getCv, hasCv, type OpenCv, type Mat, type MatVector } from './cv.js';

// Images, geometry, units
export { createRaster, createMask, type GrayRaster, type Mask } from './image/raster.js';
export type { PointPx, BoxPx } from './image/geometry.js';
export { parseLengthUm, formatLengthUm } from './units/units.js';
export { TOOL_NAME, TOOL_VERSION } from './version.js';

// Decoding, scale
export { decodeImage, readImageHeader, type DecodedImage, type DecodeOptions, type ImageFormat, type MetadataScale } from './decode/index.js';
export {
  detectScaleBar,
  chooseScale,
  scaleFromPixelSize,
  scaleFromTwoPoints,
  scaleFromMetadata,
  scaleFromBar,
  lengthUmBetween,
  type Scale,
  type ScaleSource,
  type ScaleBar,
} from './calibrate/index.js';

// Texture features
export {
  FEATURES,
  FEATURE_NAMES,
  DEFAULT_FEATURES,
  computeFeature,
  isFeatureName,
  checkFeatureNames,
  parseFeatureList,
  defaultWindowUm,
  windowPxFromUm,
  type FeatureName,
  type FeatureDefinition,
} from './texture/index.js';

// Critical distance
export {
  criticalDistance,
  methodDistances,
  resolveCriticalDistance,
  compareWidthWithL,
  impliedToughness,
  parseMaterialSheet,
  selectMaterial,
  splitMaterialRef,
  parseQuantity,
  parseLoad,
  parseCurveCsv,
  scaleCurve,
  fitNotches,
  fitWithToughness,
  parseRatePairsCsv,
  fitPowerLaw,
  evaluateRateLaw,
  type Load,
  type NotchSpecimen,
  type TcdMethod,
  type UnitSystem,
  type EchoedValue,
  type Material,
  type MaterialValue,
  type QuantityInput,
  type ResolvedDistance,
  type CompareResult,
  type ImpliedToughness,
  type Verdict,
  type WidthReference,
} from './tcd/index.js';

// Reports and views
export { summarise, specimenLines, type SpecimenLine, formatFigure, formatValue, VERDICT_HEADLINES, type ResultSummary, type QualitySummary, type Figure, type IntervalFigure } from './report/summary.js';
export {
  RESULT_COLUMNS,
  entryRow,
  metadataColumns,
  toCsv,
  toJsonLines,
  parseCsv,
  type BatchEntry,
  type BatchRow,
  type ResultColumn,
  type EntryStatus,
  type Cell,
} from './report/csv.js';
export { analyseSeries, type SeriesAnalysis } from './report/series.js';
export { buildReportHtml, card, type ReportInput } from './report/html.js';
export { buildImageReportHtml, imageEntry, type ImageReportInput } from './report/imageReport.js';
export { resultOverlay } from './report/resultOverlay.js';
export { histogramSvg, polarProfileSvg, seriesPlotSvg, escapeXml } from './report/svg.js';
export { renderOverlay, type OverlayInput } from './report/overlay.js';
export type { RgbaImage } from './draw/index.js';

// Encoding, synthetic test images
export { encodeGrayRaster, encodePng, type RasterFormat } from './encode/index.js';
export { renderFractograph, type RenderOptions, type RenderTruth } from './render/index.js';

// Teach by example (pixel classifier): label rasters, teaching, model files, class-map preview
export * from './learn/index.js';
