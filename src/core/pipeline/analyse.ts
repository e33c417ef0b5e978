/**
 * The measurement pipeline: decode → calibrate → specimen outline → texture features →
 * rim/core classification → boundary refinement → band-width profile and statistics →
 * critical-distance comparison → result (schema fractozone.result/1) and overlay.
 *
 * Pure and deterministic (no file system, no DOM): the CLI, the batch workers and the browser
 * Web Worker all call `analyseImage` / `analyseDecoded` with the same MeasureParams, so the same
 * image and parameters give the same numbers everywhere. `remeasure` re-measures an edited
 * boundary from a previous result without touching the image (what the app calls on every edit).
 */
import { CAUTION } from '../caution.js';
import { FractozoneError, isFractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import { decodeImage, type DecodedImage } from '../decode/index.js';
import { chooseScale, detectScaleBar, type Scale, type ScaleBar } from '../calibrate/index.js';
import { defaultWindowUm, windowPxFromUm, isFeatureName, boxMean, computeFeature, downsample } from '../texture/index.js';
import { findSpecimen, classifyRimCore, refineBoundary, refineOuterEdge, scaleMarkBoxes, paintOutBoxes, type Specimen, type RimCoreResult } from '../segment/index.js';
import { measureBand, type BandProfile } from '../measure/index.js';
import { resolveCriticalDistance, compareWidthWithL, impliedToughness } from '../tcd/index.js';
import { renderOverlay } from '../report/overlay.js';
import type { RgbaImage } from '../draw/index.js';
import { TOOL_NAME, TOOL_VERSION } from '../version.js';
import { validateParams } from './params.js';
import type { MeasureParams } from './types.js';
import type { PointPx, BoxPx } from '../image/geometry.js';
import { RESULT_SCHEMA, type MeasureResult, type RayResult, type WidthSummary } from './result.js';


/** How each feature scales with a multiplicative brightness change (see classifyRimCore). */
const GAIN_POWER: Record<string, number> = { localStd: 1, localVariance: 2, gradientEnergy: 2, highPassEnergy: 2, localEntropy: 0 };

/** Long side (px) of the working raster on which the texture features are classified. */
export const WORKING_LONG_SIDE_PX = 1200;

export interface InputInfo {
  file: string;
  sha256: string;
}

export type ProgressFn = (stage: string, fraction: number) => void;

/** What the shells get back besides the result: the overlay picture. */
export interface Analysis {
  result: MeasureResult;
  overlay: RgbaImage;
}

const round = (v: number, d = 4): number => {
  if (!Number.isFinite(v)) return v;
  const f = Math.pow(10, d);
  return Math.round(v * f) / f;
};
const roundPts = (pts: readonly PointPx[]): PointPx[] => pts.map((p) => ({ x: round(p.x, 2), y: round(p.y, 2) }));

function stageTimer(onProgress?: ProgressFn): { lap: (stage: string, next: string, fraction: number) => void; timings: Record<string, number> } {
  const timings: Record<string, number> = {};
  let t = performance.now();
  return {
    timings,
    lap(stage, next, fraction) {
      const n = performance.now();
      timings[stage] = round(n - t, 1);
      t = n;
      onProgress?.(next, fraction);
    },
  };
}

function resolveScale(decoded: DecodedImage, p: MeasureParams, bar: ScaleBar | null, warnings: string[]): Scale {
  const s = p.scale;
  const metadata = s.useMetadata === false ? null : decoded.metadataScale;
  const typed = s.pixelSizeUm !== undefined ? (s.pixelSizeYUm !== undefined ? { x: s.pixelSizeUm, y: s.pixelSizeYUm } : s.pixelSizeUm) : undefined;
  if (s.barLengthUm !== undefined && !bar && typed === undefined && !s.twoPoint) {
    if (!metadata) {
      throw new FractozoneError(
        'BAD_SCALE',
        'a scale-bar length was given but no scale bar was found in the image; give the pixel size (e.g. --pixel-size 4um) or two points instead',
        'input',
      );
    }
    warnings.push('a scale-bar length was given but no scale bar was found: the pixel size from the file metadata is used instead');
  }
  try {
    return chooseScale({ typed, twoPoint: s.twoPoint, barLengthUm: s.barLengthUm, bar, metadata });
  } catch (e) {
    if (isFractozoneError(e) && e.code === 'BAD_SCALE') throw new FractozoneError('BAD_SCALE', e.message, 'usage');
    throw e;
  }
}

function rayResults(band: BandProfile, umPerPx: { x: number; y: number }): RayResult[] {
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

function widthStats(band: BandProfile): WidthSummary | null {
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

/** The part of a result that follows from the polygons alone (shared by analyse and remeasure). */
function bandBlock(
  outer: readonly PointPx[],
  boundary: readonly PointPx[] | null,
  center: PointPx,
  scale: { x: number; y: number },
  imageSize: { width: number; height: number },
  p: MeasureParams,
  minWidthPx: number,
  markBoxes: readonly BoxPx[] = [],
): { band: BandProfile; block: Pick<MeasureResult['band'], 'widthUm' | 'normalWidthUm' | 'areaEquivalentWidthUm' | 'nRays' | 'nValid' | 'nOutliers' | 'profile'> } {
  const band = measureBand({
    outer,
    boundary,
    center,
    umPerPx: scale.x === scale.y ? scale.x : scale,
    nRays: p.nRays,
    exclude: p.exclude,
    imageSize,
    markBoxes,
    minWidthPx,
    outlierK: p.outlierK,
    dropOutliers: p.dropOutliers,
    seed: p.seed,
    bootstrap: p.bootstrap,
  });
  return {
    band,
    block: {
      widthUm: widthStats(band),
      normalWidthUm:
        band.normalWidth && band.normalWidth.n > 0
          ? { mean: round(band.normalWidth.meanUm, 3), median: round(band.normalWidth.medianUm, 3), n: band.normalWidth.n }
          : null,
      areaEquivalentWidthUm: band.areaWidthUm === null || !band.areaWidthComplete ? null : round(band.areaWidthUm, 3),
      nRays: band.rays.length,
      nValid: band.nValid,
      nOutliers: band.nOutliers,
      profile: rayResults(band, scale),
    },
  };
}

/**
 * Rays whose automatic boundary lies closer than 0.75 texture window to the outer edge are read as
 * "band absent" (the band cannot be resolved below the window); a manual boundary is taken as drawn.
 */
function minWidthPxFor(r: MeasureResult): number {
  return r.resolved.boundarySource === 'auto' ? 0.75 * r.resolved.windowPx : 0;
}

/** Critical distance and comparison blocks, when a material or typed values are given. */
function tcdBlocks(result: MeasureResult, p: MeasureParams): void {
  delete result.criticalDistance;
  delete result.comparison;
  const m = p.material;
  if (!m || (!m.material && !m.toughness && !m.strength)) return;
  const cd = resolveCriticalDistance({
    material: m.material,
    toughness: m.toughness,
    strength: m.strength,
    strainRate: p.strainRatePerS ?? undefined,
    seed: p.seed,
  });
  result.criticalDistance = cd;
  for (const w of cd.warnings) if (!result.warnings.includes(w)) result.warnings.push(w);
  const w = result.band.widthUm;
  if (!result.band.detected || !w) return;
  const cmp = compareWidthWithL({
    widthUm: { mean: w.mean, ci95: w.ci95 },
    L_um: cd.L_um,
    L_interval95_um: cd.interval95_um,
    reference: p.reference,
    tolerancePct: p.tolerancePct,
  });
  let implied: ReturnType<typeof impliedToughness> | null = null;
  try {
    const s = cd.inputs.strength;
    implied = impliedToughness({ mean: w.mean, ci95: w.ci95 }, s.value, { sigma0Sd_MPa: s.sd ?? undefined, reference: p.reference });
  } catch {
    implied = null;
  }
  result.comparison = { ...cmp, impliedToughness_MPa_sqrtm: implied };
}

function separabilityOf(rc: RimCoreResult): MeasureResult['band']['separability'] {
  const s = rc.separability;
  if (!s) return null;
  return {
    fisher: round(s.fisher, 4),
    overlap: round(s.overlap, 4),
    eta: round(s.eta, 4),
    coreFraction: round(s.coreFraction, 4),
    rimFraction: round(s.rimFraction, 4),
  };
}

function overlayFor(raster: GrayRaster, result: MeasureResult, band: BandProfile | null, bar: ScaleBar | null): RgbaImage {
  const w = result.band.widthUm;
  const label = [
    `${result.input.file}`,
    result.band.detected && w
      ? `band width mean ${w.mean.toFixed(1)} µm, 95% CI ${w.ci95[0].toFixed(1)}-${w.ci95[1].toFixed(1)} µm`
      : `no smooth rim band: ${result.band.reason ?? 'not detected'}`,
    result.band.detected && w ? `median ${w.median.toFixed(1)} µm, sd ${w.sd.toFixed(1)} µm, n = ${w.n} rays` : '',
    `pixel ${result.scale.umPerPx.toPrecision(4)} µm (${result.scale.source})`,
  ];
  if (result.comparison) label.push(`w/${result.comparison.reference} = ${result.comparison.ratio.toFixed(2)}: ${result.comparison.verdict}`);
  return renderOverlay({
    raster,
    umPerPx: result.scale.umPerPx,
    center: result.specimen.center,
    outer: result.specimen.outline,
    boundary: result.band.boundary?.polygon ?? null,
    rays: band
      ? band.rays.map((r) => ({ angleDeg: r.thetaDeg, outerRadiusPx: r.outerRadiusPx, boundaryRadiusPx: r.boundaryRadiusPx, valid: r.valid, outlier: r.outlier }))
      : [],
    scaleBar: bar && result.scale.source === 'scale-bar' ? bar : null,
    label: label.filter(Boolean),
  });
}

/**
 * Run the whole pipeline on a decoded image.
 *
 * @param decoded - output of decodeImage
 * @param input - file name (as the user gave it) and SHA-256 of the bytes (computed by the shell)
 * @param params - the measurement parameters (validated here)
 * @param onProgress - called with the next stage name and the fraction done
 * @returns the result (schema fractozone.result/1) and the overlay picture
 * @throws FractozoneError when the scale cannot be set, no specimen is found, or a parameter is bad
 */
export function analyseDecoded(decoded: DecodedImage, input: InputInfo, params: MeasureParams, onProgress?: ProgressFn): Analysis {
  const p = validateParams(structuredClone(params));
  for (const f of p.features) {
    if (!isFeatureName(f)) throw new FractozoneError('BAD_PARAMETER', `unknown roughness feature "${f}" (known: localStd, localEntropy, gradientEnergy, localVariance, highPassEnergy)`);
  }
  const raster = decoded.raster;
  const warnings: string[] = [];
  const T = stageTimer(onProgress);
  onProgress?.('scale bar', 0.05);

  const bar = detectScaleBar(raster);
  const scale = resolveScale(decoded, p, bar, warnings);
  const s = { x: scale.umPerPxX, y: scale.umPerPxY };
  if (Math.abs(s.x - s.y) / Math.max(s.x, s.y) > 1e-6) warnings.push(`pixels are not square (${s.x.toPrecision(4)} × ${s.y.toPrecision(4)} µm): widths are converted per ray direction`);
  T.lap('scale', 'specimen outline', 0.12);

  // Segmentation runs on a working copy (long side ≤ WORKING_LONG_SIDE_PX, area-averaged); only
  // the outer edge is refined on the full-resolution image. Working pixel (i, j) covers the
  // full-resolution point ((i + 0.5)·sx − 0.5, (j + 0.5)·sy − 0.5).
  const factor = Math.max(1, Math.max(raster.width, raster.height) / WORKING_LONG_SIDE_PX);
  const marks = bar ? scaleMarkBoxes(bar, raster.width, raster.height, raster) : [];
  const work0 = downsample(raster, factor);
  const sx = raster.width / work0.width;
  const sy = raster.height / work0.height;
  // scale marks painted out in the working copy (never in `raster`), see segment/marks.ts
  const marksW = marks.map((b) => ({ x: (b.x + 0.5) / sx - 0.5, y: (b.y + 0.5) / sy - 0.5, w: b.w / sx, h: b.h / sy }));
  const work = marks.length ? paintOutBoxes(work0, marksW) : work0;
  const toFull = (q: PointPx): PointPx => ({ x: (q.x + 0.5) * sx - 0.5, y: (q.y + 0.5) * sy - 0.5 });
  const toWork = (q: PointPx): PointPx => ({ x: (q.x + 0.5) / sx - 0.5, y: (q.y + 0.5) / sy - 0.5 });
  const specimen: Specimen = findSpecimen(work, { excludeBoxes: marksW });
  const centerW = { x: specimen.circle.cx, y: specimen.circle.cy };
  const center = toFull(centerW);
  const outer = refineOuterEdge(raster, specimen.contour.map(toFull), center, { nRays: Math.max(p.nRays, 360) });
  if (specimen.touchesFrame) warnings.push(`the specimen is cut by the image frame (${(specimen.frameContactFraction * 100).toFixed(0)} % of its outline): rays that reach the frame are not measured`);
  T.lap('specimen', 'texture', 0.25);

  const kAvg = Math.sqrt(sx * sy);
  const radiusPx = specimen.circle.radiusPx * kAvg;
  const radiusUm = radiusPx * scale.umPerPx;
  const windowUm = p.windowUm ?? defaultWindowUm({ umPerPx: scale.umPerPx, specimenRadiusUm: radiusUm, scaleFactor: factor });
  const windowPxWork = windowPxFromUm(windowUm, scale.umPerPx * kAvg);
  const windowPxFull = windowPxFromUm(windowUm, scale.umPerPx);

  let rimCore: RimCoreResult | null = null;
  let boundary: PointPx[] | null = null;
  let boundarySource: 'auto' | 'manual' = 'auto';
  let detected = true;
  let reason: string | undefined;
  if (p.boundaryPolygon) {
    boundary = p.boundaryPolygon.map((q) => ({ x: q.x, y: q.y }));
    boundarySource = 'manual';
    T.lap('texture', 'band width', 0.8);
  } else {
    const feats = p.features.map((n) => computeFeature(n, work, windowPxWork));
    T.lap('texture', 'rim/core boundary', 0.55);
    const transforms = p.features.map((n) => (n === 'localEntropy' ? 'identity' : 'log') as 'log' | 'identity');
    const gainPowers = p.features.map((n) => GAIN_POWER[n] ?? 0);
    const brightness = boxMean(work, windowPxWork);
    rimCore = classifyRimCore(specimen, feats, { windowPx: windowPxWork, featureScale: 1, center: centerW, transforms, brightness, gainPowers });
    for (const w of rimCore.warnings) warnings.push(w);
    if (!rimCore.detected || !rimCore.boundary) {
      detected = false;
      reason = rimCore.reason ?? 'no smooth rim band was found';
    } else {
      const refined = refineBoundary(work, outer.polygon.map(toWork), rimCore.boundary, centerW, { windowPx: windowPxWork, nRays: Math.max(p.nRays, 360) });
      boundary = refined.polygon.map(toFull);
    }
    T.lap('boundary', 'band width', 0.85);
  }

  const outline = roundPts(outer.polygon);
  const result: MeasureResult = {
    schema: RESULT_SCHEMA,
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    input: {
      file: input.file,
      sha256: input.sha256,
      format: decoded.format,
      widthPx: decoded.widthPx,
      heightPx: decoded.heightPx,
      bitDepth: decoded.bitDepth,
      channels: decoded.channels,
      colorType: decoded.colorType,
      pageCount: decoded.pageCount,
    },
    params: p,
    resolved: {
      windowUm: round(windowUm, 3),
      windowPx: windowPxFull,
      workingScaleFactor: round(factor, 4),
      features: [...p.features],
      boundarySource,
    },
    scale: {
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
            umPerPx: p.scale.barLengthUm !== undefined ? p.scale.barLengthUm / bar.lengthPx : null,
          }
        : null,
    },
    specimen: {
      center: { x: round(center.x, 3), y: round(center.y, 3) },
      radiusPx: round(radiusPx, 3),
      radiusUm: round(radiusUm, 3),
      circle: {
        cx: round(center.x, 3),
        cy: round(center.y, 3),
        radiusPx: round(radiusPx, 3),
        radiusUm: round(radiusUm, 3),
        rmsResidualPx: round(specimen.circle.rmsResidualPx * kAvg, 4),
      },
      ellipse: {
        cx: round(toFull({ x: specimen.ellipse.cx, y: specimen.ellipse.cy }).x, 3),
        cy: round(toFull({ x: specimen.ellipse.cx, y: specimen.ellipse.cy }).y, 3),
        semiMajorUm: round(specimen.ellipse.semiMajorPx * kAvg * scale.umPerPx, 3),
        semiMinorUm: round(specimen.ellipse.semiMinorPx * kAvg * scale.umPerPx, 3),
        angleDeg: round(specimen.ellipse.angleDeg, 3),
        rmsResidualPx: round(specimen.ellipse.rmsResidualPx * kAvg, 4),
      },
      areaMm2: round((specimen.areaPx * sx * sy * scale.umPerPxX * scale.umPerPxY) / 1e6, 5),
      equivalentRadiusUm: round(specimen.equivalentRadiusPx * kAvg * scale.umPerPx, 3),
      background: specimen.background,
      touchesFrame: specimen.touchesFrame,
      frameContactFraction: round(specimen.frameContactFraction, 4),
      ...(marks.length ? { scaleMarksPx: marks.map((b) => ({ x: round(b.x, 2), y: round(b.y, 2), w: round(b.w, 2), h: round(b.h, 2) })) } : {}),
      outline,
    },
    band: {
      detected,
      ...(reason ? { reason } : {}),
      boundary: boundary ? { source: boundarySource, polygon: roundPts(boundary) } : null,
      widthUm: null,
      normalWidthUm: null,
      areaEquivalentWidthUm: null,
      nRays: p.nRays,
      nValid: 0,
      nOutliers: 0,
      profile: [],
      separability: rimCore ? separabilityOf(rimCore) : null,
    },
    warnings,
    caution: CAUTION,
    diagnostics: { timingsMs: T.timings },
  };

  let band: BandProfile | null = null;
  if (result.band.boundary) {
    const m = bandBlock(outline, result.band.boundary.polygon, result.specimen.center, s, { width: raster.width, height: raster.height }, p, minWidthPxFor(result), result.specimen.scaleMarksPx);
    const nMark = m.band.rays.filter((q) => q.reason === 'outer-edge-at-scale-mark').length;
    if (nMark > 0) warnings.push(`the scale bar or its plate touches the specimen outline: ${nMark} rays there are not measured`);
    band = m.band;
    Object.assign(result.band, m.block);
    if (!m.block.widthUm) {
      result.band.detected = false;
      result.band.reason = 'no ray crosses both the boundary and the outer edge';
    }
  }
  tcdBlocks(result, p);
  T.lap('measure', 'overlay', 0.95);
  const overlay = overlayFor(raster, result, band, bar);
  T.lap('overlay', 'done', 1);
  return { result, overlay };
}

/**
 * Decode and analyse an image (see analyseDecoded).
 *
 * @param bytes - the file's bytes
 * @param input - file name and SHA-256 (hex) of `bytes`
 * @param params - measurement parameters
 */
export async function analyseImage(bytes: Uint8Array, input: InputInfo, params: MeasureParams, onProgress?: ProgressFn): Promise<Analysis> {
  onProgress?.('decode', 0);
  const t0 = performance.now();
  const decoded = decodeImage(bytes, { maxPixels: params.maxPixels });
  const tDecode = performance.now() - t0;
  const a = analyseDecoded(decoded, input, params, onProgress);
  a.result.diagnostics.timingsMs = { decode: round(tDecode, 1), ...a.result.diagnostics.timingsMs };
  return a;
}

/**
 * Re-measure a previous result with an edited boundary polygon and/or changed measurement
 * parameters (rays, exclusion sectors, outliers, bootstrap, material): pure geometry on the
 * stored outline, no image access. Gives the same numbers as a full run with the same boundary.
 *
 * @param prev - a previous result (from analyseImage or a result JSON)
 * @param changes - parameters to change; `boundaryPolygon` is the edited boundary (px)
 */
export function remeasure(prev: MeasureResult, changes: Partial<MeasureParams>): MeasureResult {
  const p = validateParams({ ...structuredClone(prev.params), ...structuredClone(changes) });
  const result: MeasureResult = structuredClone(prev);
  result.params = p;
  const polygon = p.boundaryPolygon ?? prev.band.boundary?.polygon ?? null;
  if (changes.boundaryPolygon) {
    result.resolved.boundarySource = 'manual';
    result.band.boundary = { source: 'manual', polygon: roundPts(changes.boundaryPolygon) };
  }
  result.warnings = prev.warnings.filter((w) => !/strain-rate law|invented demo data|extrapolat/.test(w));
  if (polygon && result.band.boundary) {
    const m = bandBlock(
      result.specimen.outline,
      result.band.boundary.polygon,
      result.specimen.center,
      { x: result.scale.umPerPxX, y: result.scale.umPerPxY },
      { width: result.input.widthPx, height: result.input.heightPx },
      p,
      minWidthPxFor(result),
      result.specimen.scaleMarksPx,
    );
    Object.assign(result.band, m.block);
    result.band.detected = m.block.widthUm !== null;
    if (result.band.detected) delete result.band.reason;
    else result.band.reason = 'no ray crosses both the boundary and the outer edge';
  }
  tcdBlocks(result, p);
  result.diagnostics = { timingsMs: {} };
  return result;
}
