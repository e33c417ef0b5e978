/**
 * The versioned result of one measurement (`fractozone.result/2`): what `analyseImage`,
 * `analyseDecoded` and `remeasure` return, what the CLI writes as `<name>.result.json`, what the
 * batch workers send back, what the reports, the CSV rows and the web app read. Every field is
 * typed here, with its unit in its name (µm `…Um`, px `…Px`, mm² `…Mm2`).
 *
 * A result that went through JSON is the same object except that non-finite numbers (for example a
 * median interval without a bootstrap) read back as `null`; readers that print numbers check them
 * with `Number.isFinite`.
 */
import type { ScaleSource } from '../calibrate/scale.js';
import type { ScaleBar } from '../calibrate/scaleBar.js';
import type { DecodedImage, MetadataScale } from '../decode/types.js';
import type { BoxPx, PointPx } from '../image/geometry.js';
import type { RayReason } from '../measure/band.js';
import type { WidthStatistics } from '../measure/statistics.js';
import type { CompareResult, ImpliedToughness } from '../tcd/compare.js';
import type { ResolvedDistance } from '../tcd/resolve.js';
import type { FeatureName } from '../texture/registry.js';
import type { Warning } from '../warnings.js';
import type { MeasureParams, VerdictBasis } from './types.js';

/** Schema name and version of {@link MeasureResult}; a change of the result bumps it. */
export const RESULT_SCHEMA = 'fractozone.result/2' as const;

/** Where the rim/core boundary came from: found by the texture stages, or drawn / given by a person. */
export type BoundarySource = 'auto' | 'manual';

/** The program that wrote the result. */
export interface ResultTool {
  name: string;
  version: string;
}

/** What the decoder says about an image file (see decode/types.ts for each field). */
export type ImageFacts = Pick<DecodedImage, 'format' | 'widthPx' | 'heightPx' | 'bitDepth' | 'channels' | 'colorType' | 'pageCount'>;

/** The image file measured. */
export interface ResultInput extends ImageFacts {
  /** File name as the user gave it (no folder for the CLI). */
  file: string;
  /** SHA-256 of the file's bytes, hex (computed by the shell). */
  sha256: string;
}

/** What was derived from the parameters for this image. */
export interface ResolvedSettings {
  /** Texture window side actually used, µm. */
  windowUm: number;
  /** The same window in full-resolution px (odd). */
  windowPx: number;
  /** Full-resolution px per working-copy px (≥ 1). */
  workingScaleFactor: number;
  features: FeatureName[];
  boundarySource: BoundarySource;
}

/** The scale bar found in the image (full-resolution px). */
export interface DetectedBar extends Omit<ScaleBar, 'plate' | 'labelBox'> {
  /** µm per px from the given bar length, or null when no bar length was given. */
  umPerPx: number | null;
}

/** The scale used, where it came from, and what else the image offered. */
export interface ResultScale {
  /** √(umPerPxX·umPerPxY), µm per px. */
  umPerPx: number;
  umPerPxX: number;
  umPerPxY: number;
  source: ScaleSource;
  /** Human-readable origin, e.g. "scale bar 1000 µm = 222.0 px (horizontal)". */
  detail: string;
  /** Pixel size in the file's metadata (used or not), or null. */
  metadata: MetadataScale | null;
  /** Why the metadata gave no scale, or what was noticed, or null. */
  metadataNote: string | null;
  detectedBar: DetectedBar | null;
}

/** Fitted circle of the outer edge, full-resolution px and µm. */
export interface CircleSummary {
  cx: number;
  cy: number;
  radiusPx: number;
  radiusUm: number;
  rmsResidualPx: number;
}

/** Fitted ellipse of the outer edge; angle of the major axis in degrees, project convention. */
export interface EllipseSummary {
  cx: number;
  cy: number;
  semiMajorUm: number;
  semiMinorUm: number;
  angleDeg: number;
  rmsResidualPx: number;
}

/** One closed edge around the rough core found by the outline search (segment/fractureEdge.ts). */
export interface EdgeCandidate {
  /** Equivalent diameter of the edge (2 × mean distance from the centre), full-resolution px and µm. */
  diameterPx: number;
  diameterUm: number;
  /** Its centre, full-resolution px. */
  center: PointPx;
  /** Edge strength: mean step across the edge relative to the texture scatter (0..~5). */
  prominence: number;
  /** Fraction of the rays on which the edge was found. */
  coverage: number;
  /** RMS deviation of the edge from its fitted ellipse, px: small for a turned or fractured round edge. */
  roundnessPx: number;
  /** What the search made of it. */
  role: 'chosen' | 'candidate' | 'rejected';
  /** Why, in a few words (e.g. "smooth machined ring outside the fracture surface: notch flank"). */
  note: string;
  /** The edge, 72 points, full-resolution px. */
  outline: PointPx[];
}

/** How the outline was chosen: every closed edge considered, and the rule that picked one. */
export interface EdgeSearch {
  /** The rule that decided, e.g. "outermost-rough-edge", "notch-flank", "section-diameter". */
  rule: string;
  /** True when the outline is the silhouette of the part (the chosen edge follows it). */
  outlineFromSilhouette: boolean;
  candidates: EdgeCandidate[];
}

/** The specimen (fracture surface) outline. */
export interface ResultSpecimen {
  /** Ray origin: the fitted circle's centre, px. */
  center: PointPx;
  radiusPx: number;
  radiusUm: number;
  circle: CircleSummary;
  ellipse: EllipseSummary;
  areaMm2: number;
  /** √(area/π), µm. */
  equivalentRadiusUm: number;
  background: 'dark' | 'bright';
  touchesFrame: boolean;
  /** Fraction of the outline on the image frame. */
  frameContactFraction: number;
  /**
   * Boxes of the detected scale bar, plate and label (px), painted out before the outline was
   * found; rays whose outer edge ends in one are not measured. Absent when no bar was found.
   */
  scaleMarksPx?: BoxPx[];
  /** Outer edge used for the rays (px). */
  outline: PointPx[];
  /** The edges the outline was chosen from and why; null when the outline was not searched (model, hand-drawn). */
  edgeSearch: EdgeSearch | null;
}

/**
 * Statistics of the valid ray widths as reported, µm, rounded: the fields of the computation
 * (measure/statistics.ts `WidthStatistics`, where each is defined) under their reported names.
 */
export interface WidthSummary extends Pick<WidthStatistics, 'n' | 'nEff' | 'mean' | 'median' | 'sd' | 'min' | 'max' | 'p05' | 'p95'> {
  /** 95 % confidence interval of the mean (`ci95Mean`). */
  ci95: [number, number];
  /** 95 % interval of the median, circular block bootstrap over the rays (`ci95Median`; [NaN, NaN] → `[null, null]` in JSON without a bootstrap). */
  medianCi95: [number, number];
}

/** One ray of the width profile, µm. */
export interface RayResult {
  angleDeg: number;
  widthUm: number | null;
  /** false → left out of the statistics (see `reason`). */
  valid: boolean;
  /** Why the ray is invalid, or 'outlier' for a valid ray that is flagged. */
  reason?: RayReason;
  outerRadiusUm: number | null;
  boundaryRadiusUm: number | null;
}

/** Separability of the rim and core textures (combined feature, transition zone left out). */
export interface SeparabilitySummary {
  /** Fisher ratio (μ_core − μ_rim)² / (σ_core² + σ_rim²). */
  fisher: number;
  /** Histogram overlap 0 (disjoint) … 1 (identical). */
  overlap: number;
  /** Otsu's between-class / total variance ratio. */
  eta: number;
  coreFraction: number;
  rimFraction: number;
}

/** The rim/core boundary polygon (px) and where it came from. */
export interface ResultBoundary {
  source: BoundarySource;
  polygon: PointPx[];
}

/** Width measured along the inward normal of the outer edge, µm. */
export interface NormalWidthSummary {
  mean: number;
  median: number;
  n: number;
}

/** One method variation of the parameter range and the mean width it gave (µm; null: no band). */
export interface ParameterVariation {
  /** e.g. "window ×0.7", "without localEntropy", "boundary level: log midpoint". */
  name: string;
  meanUm: number | null;
}

/** One localisation source of the measurement budget (measure/uncertainty.ts), µm. */
export interface LocalisationBudget {
  sdUm: number;
  randomSdUm: number;
  systematicSdUm: number;
  perRaySdUm: number;
  /** Integrated autocorrelation time of the residual profile, rays. */
  correlationRays: number;
  /** Share of the combined variance, %. */
  sharePct: number;
}

/** What the measurement interval is made of: each source's standard uncertainty and share. */
export interface UncertaintyBudget {
  boundary: LocalisationBudget;
  outerEdge: LocalisationBudget;
  scale: { sdUm: number; relativeSdPct: number; sharePct: number; detail: string };
  /** √(Σ u²), µm; the interval is mean ± coverageFactor·combinedSdUm. */
  combinedSdUm: number;
  coverageFactor: number;
}

/**
 * The uncertainty of the band's mean width, answering three questions (README, "Uncertainty"):
 * where this specimen's mean lies (`measurementCi95Um`), how far a sample of the circumference
 * would scatter (`circumferentialCi95Um`, the interval of `widthUm.ci95`), and how much the
 * method's choices move it (`parameterRangeUm`).
 */
export interface BandUncertainty {
  /** 95 % interval of this specimen's circumferential mean: placement of boundary and outer edge, and scale. */
  measurementCi95Um: [number, number];
  /** 95 % interval of the mean of w(θ) as a random process (effective sample size); = widthUm.ci95. */
  circumferentialCi95Um: [number, number];
  /** Min and max of the mean over the method variations (and the mean itself), or null (see the note). */
  parameterRangeUm: [number, number] | null;
  /** What the range covers, or why there is none. */
  parameterRangeNote: string;
  variations: ParameterVariation[];
  budget: UncertaintyBudget;
}

/** The smooth rim band: boundary, width profile and statistics. */
export interface ResultBand {
  detected: boolean;
  /** Why no band was measured (only when `detected` is false). */
  reason?: string;
  boundary: ResultBoundary | null;
  widthUm: WidthSummary | null;
  normalWidthUm: NormalWidthSummary | null;
  /** √(A_outer/π) − √(A_core/π), µm; null when the section is not complete (frame, exclusions). */
  areaEquivalentWidthUm: number | null;
  nRays: number;
  nValid: number;
  nOutliers: number;
  profile: RayResult[];
  /** Null for a manual boundary (no classification ran). */
  separability: SeparabilitySummary | null;
  /** Present when a width was measured (results written before it lack it). */
  uncertainty?: BandUncertainty;
}

/** The pixel classifier a result was segmented with (`measure --model`; learn/). */
export interface ResultModel {
  /** SHA-256 of the model file's bytes, hex. */
  sha256: string;
  /** Schema and feature set of the model file. */
  schema: string;
  featureSet: string;
  /** Feature windows, µm. */
  windowsUm: number[];
  /** Out-of-bag accuracy on the model's own training pixels. */
  oobAccuracy: number;
  /** SHA-256 of the images it was trained on. */
  trainingImages: string[];
  /**
   * Mean probability of the expected class beside the boundary (P(rim) outside it, P(core)
   * inside it, half a window away) and beside the outer edge; 0..1, null without a boundary.
   */
  confidence: { boundary: number | null; outerEdge: number };
}

/** Which intervals the comparison with L used. */
export interface ComparisonBasis {
  /** The width interval: 'measurement' (default), 'circumferential' or 'measurement+method'. */
  width: VerdictBasis;
  widthCi95Um: [number, number];
  /** Whether L had an interval ('none': L taken as exact; the note says why). */
  L: 'interval' | 'none';
  /** One sentence naming both. */
  note: string;
}

/** The width held against L, L/2 or 2L, and the toughness the width implies. */
export interface Comparison extends CompareResult {
  /** Absent in results written before it (the circumferential interval was used then). */
  basis?: ComparisonBasis;
  impliedToughness_MPa_sqrtm: ImpliedToughness | null;
}

/** How far the numbers of a result can be trusted (pipeline/stages/quality.ts). */
export type QualityVerdict = 'ok' | 'check' | 'unreliable';

/** The quality verdict and the warnings that set it (severity `check` or `unreliable`). */
export interface Quality {
  verdict: QualityVerdict;
  reasons: Warning[];
}

/**
 * One of several specimens in the frame (both mating halves, or a row): its own outline, band,
 * warnings and verdict. `specimens[0]` (id "A") is the specimen of the top-level `specimen` and
 * `band` blocks, with the same numbers.
 */
export interface ResultSpecimenRecord {
  /** "A", "B", … in reading order: left to right (top to bottom when stacked). */
  id: string;
  specimen: ResultSpecimen;
  band: ResultBand;
  /** The warnings of this specimen's outline, band and result-level rules (scale warnings stay top-level). */
  warnings: Warning[];
  quality: Quality;
}

/** The two halves compared: the consistency figure of a fracture measured on both mating surfaces. */
export interface ResultHalves {
  /** Ids of the two specimens compared (A and B). */
  ids: [string, string];
  /** Mean band width of each, µm (null where no band was measured). */
  meanWidthsUm: [number | null, number | null];
  /** Mean of A − mean of B, µm (null unless both have a width). */
  differenceUm: number | null;
  /** (A − B) / ((A + B) / 2) × 100, % (null unless both have a width). */
  relativeDifferencePct: number | null;
}

/** Wall-clock figures; not part of the reproducible content. */
export interface Diagnostics {
  /** Milliseconds per stage. */
  timingsMs: Record<string, number>;
}

/** The result object written as JSON by every shell; the keys are written in this order. */
export interface MeasureResult {
  schema: typeof RESULT_SCHEMA;
  tool: ResultTool;
  input: ResultInput;
  /** Whether the numbers can be used as they stand: read this first. */
  quality: Quality;
  /** Every parameter used (validated). */
  params: MeasureParams;
  resolved: ResolvedSettings;
  scale: ResultScale;
  specimen: ResultSpecimen;
  band: ResultBand;
  /**
   * Present when the image holds two or more specimens (each measured): one record each, A first.
   * The top-level `specimen` and `band` are then specimen A's.
   */
  specimens?: ResultSpecimenRecord[];
  /** Present when exactly two specimens were measured: the halves compared. */
  halves?: ResultHalves;
  /** Present when the image was segmented with a pixel classifier (`--model`). */
  model?: ResultModel;
  /** Present when a material or typed toughness and strength were given. */
  criticalDistance?: ResolvedDistance;
  /** Present when a critical distance and a band width are both known. */
  comparison?: Comparison;
  /** Every warning, each with its code (core/warnings.ts), in the order the stages gave them. */
  warnings: Warning[];
  caution: string;
  diagnostics: Diagnostics;
}

/** A result with its keys in the documented order (for results built or changed in parts). */
export function inResultOrder(r: MeasureResult): MeasureResult {
  return {
    schema: r.schema,
    tool: r.tool,
    input: r.input,
    quality: r.quality,
    params: r.params,
    resolved: r.resolved,
    scale: r.scale,
    specimen: r.specimen,
    band: r.band,
    ...(r.specimens ? { specimens: r.specimens } : {}),
    ...(r.halves ? { halves: r.halves } : {}),
    ...(r.model ? { model: r.model } : {}),
    ...(r.criticalDistance ? { criticalDistance: r.criticalDistance } : {}),
    ...(r.comparison ? { comparison: r.comparison } : {}),
    warnings: r.warnings,
    caution: r.caution,
    diagnostics: r.diagnostics,
  };
}
