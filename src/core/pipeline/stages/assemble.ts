/**
 * Stage 8, assemble: the result object (schema fractozone.result/2) from the stage outputs, with
 * every number rounded to its stored precision (precision.ts). Also the band block that
 * `remeasure` rebuilds on a saved result.
 */
import { CAUTION } from '../../caution.js';
import type { DecodedImage } from '../../decode/index.js';
import type { BoxPx } from '../../image/geometry.js';
import type { BandProfile } from '../../measure/index.js';
import type { Separability } from '../../segment/index.js';
import { TOOL_NAME, TOOL_VERSION } from '../../version.js';
import type { Warning } from '../../warnings.js';
import type { WorkingFrame } from '../frame.js';
import { round, storedBox, storedPoint, storedPolygon } from '../precision.js';
import {
  RESULT_SCHEMA,
  type MeasureResult,
  type Quality,
  type RayResult,
  type ResultBand,
  type ResultModel,
  type ResultScale,
  type ResultSpecimen,
  type SeparabilitySummary,
  type WidthSummary,
} from '../result.js';
import type { InputInfo, MeasureParams } from '../types.js';
import type { Calibration } from './calibrate.js';
import type { CriticalDistanceBlocks } from './compare.js';
import type { SpecimenLocation } from './locateSpecimen.js';
import type { StoredGeometry } from './measure.js';
import type { RimBoundary } from './refineBoundary.js';
import type { TextureWindow } from './texture.js';

/** Why a band with a boundary still has no width. */
export const NO_CROSSING_REASON = 'no ray crosses both the boundary and the outer edge';

/** The part of the band block that follows from a measurement. */
export type MeasuredBand = Pick<ResultBand, 'widthUm' | 'normalWidthUm' | 'areaEquivalentWidthUm' | 'nRays' | 'nValid' | 'nOutliers' | 'profile'>;

/** The geometry the band is measured on, as the result stores it. */
export function storedGeometry(location: SpecimenLocation, boundary: RimBoundary, marks: readonly BoxPx[]): StoredGeometry {
  return {
    outline: storedPolygon(location.outer),
    boundary: boundary.polygon ? storedPolygon(boundary.polygon) : null,
    center: storedPoint(location.center),
    marks: marks.map(storedBox),
  };
}

function summariseWidth(band: BandProfile): WidthSummary | null {
  const s = band.stats;
  if (!s || s.n === 0) return null;
  const ci = s.ci95Median ?? [NaN, NaN];
  return {
    n: s.n,
    nEff: round(s.nEff, 2),
    mean: round(s.mean, 3),
    median: round(s.median, 3),
    sd: round(s.sd, 3),
    min: round(s.min, 3),
    max: round(s.max, 3),
    p05: round(s.p05, 3),
    p95: round(s.p95, 3),
    ci95: [round(s.ci95Mean[0], 3), round(s.ci95Mean[1], 3)],
    medianCi95: [round(ci[0], 3), round(ci[1], 3)],
  };
}

function reportRays(band: BandProfile, umPerPx: { x: number; y: number }): RayResult[] {
  return band.rays.map((r) => {
    const t = (r.thetaDeg * Math.PI) / 180;
    const k = Math.hypot(Math.cos(t) * umPerPx.x, Math.sin(t) * umPerPx.y);
    const out: RayResult = {
      angleDeg: round(r.thetaDeg, 6),
      widthUm: r.widthUm === null ? null : round(r.widthUm, 3),
      valid: r.valid,
      outerRadiusUm: r.outerRadiusPx === null ? null : round(r.outerRadiusPx * k, 3),
      boundaryRadiusUm: r.boundaryRadiusPx === null ? null : round(r.boundaryRadiusPx * k, 3),
    };
    if (r.reason) out.reason = r.reason;
    return out;
  });
}

/** The reported figures of a band measurement (µm, rounded). */
export function reportWidths(band: BandProfile, umPerPx: { x: number; y: number }): MeasuredBand {
  const nw = band.normalWidth;
  return {
    widthUm: summariseWidth(band),
    normalWidthUm: nw && nw.n > 0 ? { mean: round(nw.meanUm, 3), median: round(nw.medianUm, 3), n: nw.n } : null,
    areaEquivalentWidthUm: band.areaWidthUm === null || !band.areaWidthComplete ? null : round(band.areaWidthUm, 3),
    nRays: band.rays.length,
    nValid: band.nValid,
    nOutliers: band.nOutliers,
    profile: reportRays(band, umPerPx),
  };
}

function summariseSeparability(s: Separability | null): SeparabilitySummary | null {
  if (!s) return null;
  return { fisher: round(s.fisher, 4), overlap: round(s.overlap, 4), eta: round(s.eta, 4), coreFraction: round(s.coreFraction, 4), rimFraction: round(s.rimFraction, 4) };
}

/** The band block with a measurement of its boundary applied: no width → not detected, with the reason. */
export function withMeasurement(band: ResultBand, measured: MeasuredBand): ResultBand {
  const detected = measured.widthUm !== null;
  return { detected, ...(detected ? {} : { reason: NO_CROSSING_REASON }), boundary: band.boundary, ...measured, separability: band.separability };
}

/** The band block from the boundary stage and, when there is a boundary, its measurement. */
export function assembleBand(boundary: RimBoundary, geometry: StoredGeometry, measured: MeasuredBand | null, nRays: number): ResultBand {
  const band: ResultBand = {
    detected: boundary.detected,
    ...(boundary.reason ? { reason: boundary.reason } : {}),
    boundary: geometry.boundary ? { source: boundary.source, polygon: geometry.boundary } : null,
    widthUm: null,
    normalWidthUm: null,
    areaEquivalentWidthUm: null,
    nRays,
    nValid: 0,
    nOutliers: 0,
    profile: [],
    separability: summariseSeparability(boundary.separability),
  };
  return measured ? withMeasurement(band, measured) : band;
}

/** The scale block of the result. */
export function assembleScale(decoded: DecodedImage, calibration: Calibration, params: MeasureParams): ResultScale {
  const { scale, bar } = calibration;
  return {
    umPerPx: scale.umPerPx,
    umPerPxX: scale.umPerPxX,
    umPerPxY: scale.umPerPxY,
    source: scale.source,
    detail: scale.detail,
    metadata: decoded.metadataScale ? { ...decoded.metadataScale } : null,
    metadataNote: decoded.metadataNote ?? null,
    detectedBar: bar
      ? {
          x0: round(bar.x0, 2),
          y0: round(bar.y0, 2),
          x1: round(bar.x1, 2),
          y1: round(bar.y1, 2),
          lengthPx: round(bar.lengthPx, 3),
          thicknessPx: round(bar.thicknessPx, 2),
          orientation: bar.orientation,
          polarity: bar.polarity,
          confidence: round(bar.confidence, 3),
          umPerPx: params.scale.barLengthUm !== undefined ? params.scale.barLengthUm / bar.lengthPx : null,
        }
      : null,
  };
}

function assembleSpecimen(frame: WorkingFrame, location: SpecimenLocation, calibration: Calibration, geometry: StoredGeometry): ResultSpecimen {
  const { specimen: sp, center, radiusPx, radiusUm } = location;
  const { scale } = calibration;
  const ellipseCentre = frame.toFull({ x: sp.ellipse.cx, y: sp.ellipse.cy });
  return {
    center: geometry.center,
    radiusPx: round(radiusPx, 3),
    radiusUm: round(radiusUm, 3),
    circle: {
      cx: round(center.x, 3),
      cy: round(center.y, 3),
      radiusPx: round(radiusPx, 3),
      radiusUm: round(radiusUm, 3),
      rmsResidualPx: round(frame.lengthToFull(sp.circle.rmsResidualPx), 4),
    },
    ellipse: {
      cx: round(ellipseCentre.x, 3),
      cy: round(ellipseCentre.y, 3),
      semiMajorUm: round(frame.lengthToFull(sp.ellipse.semiMajorPx) * scale.umPerPx, 3),
      semiMinorUm: round(frame.lengthToFull(sp.ellipse.semiMinorPx) * scale.umPerPx, 3),
      angleDeg: round(sp.ellipse.angleDeg, 3),
      rmsResidualPx: round(frame.lengthToFull(sp.ellipse.rmsResidualPx), 4),
    },
    areaMm2: round((frame.areaToFull(sp.areaPx) * scale.umPerPxX * scale.umPerPxY) / 1e6, 5),
    equivalentRadiusUm: round(frame.lengthToFull(sp.equivalentRadiusPx) * scale.umPerPx, 3),
    background: sp.background,
    touchesFrame: sp.touchesFrame,
    frameContactFraction: round(sp.frameContactFraction, 4),
    ...(geometry.marks.length ? { scaleMarksPx: geometry.marks } : {}),
    outline: geometry.outline,
    edgeSearch: location.edgeSearch ?? null,
  };
}

/** Everything the result is assembled from. */
export interface AssembleInput {
  input: InputInfo;
  decoded: DecodedImage;
  params: MeasureParams;
  calibration: Calibration;
  frame: WorkingFrame;
  location: SpecimenLocation;
  window: TextureWindow;
  boundarySource: RimBoundary['source'];
  geometry: StoredGeometry;
  /** The assembled scale and band blocks (the quality rules read them too). */
  scale: ResultScale;
  band: ResultBand;
  criticalDistance: CriticalDistanceBlocks;
  /** The pixel classifier used (`--model`), when one was. */
  model?: ResultModel;
  /** All warnings and the verdict (stages/quality.ts). */
  warnings: Warning[];
  quality: Quality;
  /** Stage timings, filled in as the run goes on (the overlay adds its own after assembly). */
  timingsMs: Record<string, number>;
}

/** The result object. */
export function assembleResult(a: AssembleInput): MeasureResult {
  const { decoded, params: p } = a;
  const result: MeasureResult = {
    schema: RESULT_SCHEMA,
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    input: {
      file: a.input.file,
      sha256: a.input.sha256,
      format: decoded.format,
      widthPx: decoded.widthPx,
      heightPx: decoded.heightPx,
      bitDepth: decoded.bitDepth,
      channels: decoded.channels,
      colorType: decoded.colorType,
      pageCount: decoded.pageCount,
    },
    quality: a.quality,
    params: p,
    resolved: {
      windowUm: round(a.window.windowUm, 3),
      windowPx: a.window.windowPxFull,
      workingScaleFactor: round(a.frame.factor, 4),
      features: [...p.features],
      boundarySource: a.boundarySource,
    },
    scale: a.scale,
    specimen: assembleSpecimen(a.frame, a.location, a.calibration, a.geometry),
    band: a.band,
    ...(a.model ? { model: a.model } : {}),
    ...(a.criticalDistance.criticalDistance ? { criticalDistance: a.criticalDistance.criticalDistance } : {}),
    ...(a.criticalDistance.comparison ? { comparison: a.criticalDistance.comparison } : {}),
    warnings: a.warnings,
    caution: CAUTION,
    diagnostics: { timingsMs: a.timingsMs },
  };
  return result;
}
