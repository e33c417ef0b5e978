/**
 * Results that follow their inputs without touching the image: from the result of a full run (the
 * "base") and the current parameters, recompute everything that depends on them from the stored
 * geometry — a new scale, a hand-corrected specimen outline, an edited boundary, sectors, rays,
 * outlier rule, material — or say why only a full run can give the right numbers.
 *
 * What may change without a full run (all pure geometry on the stored polygons, milliseconds):
 * - the scale (typed pixel size, two points, scale-bar length, metadata): the outline and boundary
 *   are found in pixels, and the default texture window is a fixed fraction of the specimen radius
 *   in pixels, so a new scale only converts lengths (see {@link rescaleResult});
 * - the specimen outline (see {@link withOutline}), the boundary polygon, exclusion sectors, the
 *   number of rays up to 360, outlier rule, bootstrap, seed, material, strain rate, reference,
 *   tolerance (see `remeasure`).
 * What needs a full run ({@link fullRunReason}): other roughness features, another typed texture
 * window (or a typed window at another scale) while the boundary is the automatic one, and more
 * than 360 rays (the outline and boundary are traced with max(rays, 360) rays).
 *
 * Rounding: the band widths and statistics come from the same rounded polygons as in a full run and
 * are identical to it; specimen sizes in µm (radius, ellipse semi-axes, area, equivalent radius) and
 * the automatic window in µm are converted from their rounded stored values, so they can differ
 * from a full run in the last printed digits (relative 1e-5: the stored radius in px has 3 decimals).
 */
import { FractozoneError } from '../errors.js';
import { chooseScale, type Scale, type ScaleBar } from '../calibrate/index.js';
import type { PointPx } from '../image/geometry.js';
import { polygonArea } from '../measure/geometry.js';
import { fitCircle, fitEllipseToPoints } from '../segment/fit.js';
import { windowPxFromUm } from '../texture/window.js';
import { mergeWarnings, warn, type Warning, type WarningCode } from '../warnings.js';
import { canonicalJson, validateParams } from './params.js';
import { round, storedPoint, storedPolygon } from './precision.js';
import { remeasure } from './remeasure.js';
import type { MeasureResult } from './result.js';
import type { MeasureParams, ScaleParams } from './types.js';

/** Rays the outline and the automatic boundary were traced with in a full run. */
const tracedRays = (p: MeasureParams): number => Math.max(p.nRays, 360);

/** The texture window in px a full run would use at this scale, or null for the automatic one. */
function typedWindowPx(p: MeasureParams, umPerPx: number): number | null {
  return p.windowUm === null ? null : windowPxFromUm(p.windowUm, umPerPx);
}

/**
 * Why the parameters cannot be applied to `base` without a full run (segmentation), or null.
 *
 * @param base - result of a full run
 * @param params - the parameters wanted now
 * @returns one sentence naming the input that changed, or null when {@link recompute} applies
 */
export function fullRunReason(base: MeasureResult, params: MeasureParams): string | null {
  const prev = base.params;
  if (tracedRays(params) !== tracedRays(prev)) return 'the number of rays above 360 changes how finely the outline and the boundary are traced';
  const section = params.sectionDiameterUm ?? null;
  if (section !== (prev.sectionDiameterUm ?? null)) return 'another section diameter changes which edge is taken as the outline and its cross-check';
  if (section !== null && canonicalJson(params.scale) !== canonicalJson(prev.scale)) return 'with a section diameter set, another scale changes which edge is taken as the outline';
  const autoBoundary = params.boundaryPolygon === null;
  if (!autoBoundary) return null;
  if (canonicalJson(params.features) !== canonicalJson(prev.features)) return 'other roughness features change the automatic boundary';
  if (params.windowUm !== prev.windowUm) return 'another texture window changes the automatic boundary';
  if (params.windowUm !== null) {
    const scale = scaleFor(base, params.scale);
    if (typedWindowPx(params, scale.umPerPx) !== base.resolved.windowPx) return 'at the new scale the texture window covers another number of pixels, which changes the automatic boundary';
  }
  return null;
}

/** The detected bar of a result as a ScaleBar, its length recovered to full precision when possible. */
function storedBar(base: MeasureResult): ScaleBar | null {
  const b = base.scale.detectedBar;
  if (!b) return null;
  let lengthPx = b.lengthPx;
  const usedLen = base.params.scale.barLengthUm;
  if (base.scale.source === 'scale-bar' && usedLen !== undefined) {
    // the bar set the old scale: its unrounded length is exactly barLength / pitch along the bar
    lengthPx = usedLen / (b.orientation === 'vertical' ? base.scale.umPerPxY : base.scale.umPerPxX);
  }
  return { x0: b.x0, y0: b.y0, x1: b.x1, y1: b.y1, lengthPx, thicknessPx: b.thicknessPx, orientation: b.orientation, polarity: b.polarity, confidence: b.confidence };
}

/**
 * The scale a full run would choose for these scale parameters on this image (same precedence and
 * messages as the pipeline), from the bar and metadata stored in the result.
 *
 * @throws FractozoneError BAD_SCALE when the parameters give no scale for this image
 */
export function scaleFor(base: MeasureResult, s: ScaleParams): Scale {
  const metadata = s.useMetadata === false ? null : base.scale.metadata;
  const typed = s.pixelSizeUm !== undefined ? (s.pixelSizeYUm !== undefined ? { x: s.pixelSizeUm, y: s.pixelSizeYUm } : s.pixelSizeUm) : undefined;
  return chooseScale({ typed, twoPoint: s.twoPoint, barLengthUm: s.barLengthUm, bar: storedBar(base), metadata });
}

/** The warnings the calibrate stage of a full run gives (they always come first in a result). */
function scaleWarnings(base: MeasureResult, s: ScaleParams, scale: Scale): Warning[] {
  const out: Warning[] = [];
  if (s.barLengthUm !== undefined && !base.scale.detectedBar && s.pixelSizeUm === undefined && !s.twoPoint) {
    out.push(warn('SCALE_BAR_NOT_FOUND', 'a scale-bar length was given but no scale bar was found: the pixel size from the file metadata is used instead'));
  }
  const x = scale.umPerPxX;
  const y = scale.umPerPxY;
  if (Math.abs(x - y) / Math.max(x, y) > 1e-6) out.push(warn('NON_SQUARE_PIXELS', `pixels are not square (${x.toPrecision(4)} × ${y.toPrecision(4)} µm): widths are converted per ray direction`));
  return out;
}

const SCALE_WARNINGS: ReadonlySet<WarningCode> = new Set<WarningCode>(['SCALE_BAR_NOT_FOUND', 'NON_SQUARE_PIXELS']);

/**
 * The result at another scale: scale block, specimen sizes in µm, resolved window, scale warnings
 * and the echoed parameters. The band block is left for `remeasure` (which reads the new pitches).
 *
 * @param base - result of a full run (or of an earlier recompute)
 * @param s - the new scale parameters
 * @throws FractozoneError BAD_SCALE when they give no scale for this image
 */
export function rescaleResult(base: MeasureResult, s: ScaleParams): MeasureResult {
  const scale = scaleFor(base, s);
  const r: MeasureResult = structuredClone(base);
  const old = base.scale;
  const k = scale.umPerPx / old.umPerPx;
  r.params.scale = structuredClone(s);
  r.scale = {
    umPerPx: scale.umPerPx,
    umPerPxX: scale.umPerPxX,
    umPerPxY: scale.umPerPxY,
    source: scale.source,
    detail: scale.detail,
    metadata: old.metadata,
    metadataNote: old.metadataNote,
    detectedBar: old.detectedBar ? { ...old.detectedBar, umPerPx: s.barLengthUm !== undefined ? s.barLengthUm / (storedBar(base)?.lengthPx ?? old.detectedBar.lengthPx) : null } : null,
  };
  const changed = scale.umPerPxX !== old.umPerPxX || scale.umPerPxY !== old.umPerPxY;
  if (changed) {
    const sp = r.specimen;
    sp.radiusUm = round(sp.radiusPx * scale.umPerPx, 3);
    sp.circle.radiusUm = round(sp.circle.radiusPx * scale.umPerPx, 3);
    sp.ellipse.semiMajorUm = round(sp.ellipse.semiMajorUm * k, 3);
    sp.ellipse.semiMinorUm = round(sp.ellipse.semiMinorUm * k, 3);
    sp.areaMm2 = round((sp.areaMm2 * scale.umPerPxX * scale.umPerPxY) / (old.umPerPxX * old.umPerPxY), 5);
    sp.equivalentRadiusUm = round(sp.equivalentRadiusUm * k, 3);
    for (const c of sp.edgeSearch?.candidates ?? []) c.diameterUm = round(c.diameterPx * scale.umPerPx, 1);
  }
  const w = r.params.windowUm;
  r.resolved.windowUm = w === null ? (changed ? round(base.resolved.windowUm * k, 3) : base.resolved.windowUm) : round(w, 3);
  r.resolved.windowPx = w === null ? base.resolved.windowPx : windowPxFromUm(w, scale.umPerPx);
  r.warnings = [...scaleWarnings(base, s, scale), ...base.warnings.filter((x) => !SCALE_WARNINGS.has(x.code))];
  return r;
}

/** The warning a hand-corrected outline leaves in the result. */
export const OUTLINE_CORRECTED = warn('OUTLINE_CORRECTED', 'the specimen outline was corrected by hand: centre, radius, ellipse and area are fitted to the corrected outline');

/**
 * The result with a hand-corrected specimen outline: the outline, the fitted circle (its centre is
 * the centre of the rays), the ellipse, the area and the equivalent radius follow the new polygon.
 * Needs the OpenCV runtime (ellipse fit).
 *
 * @param base - a result
 * @param outline - the corrected outer edge, px (at least 5 points)
 * @throws FractozoneError BAD_BOUNDARY when the polygon cannot be fitted
 */
export function withOutline(base: MeasureResult, outline: readonly PointPx[]): MeasureResult {
  const circle = outline.length >= 5 ? fitCircle(outline) : null;
  const ellipse = circle ? fitEllipseToPoints(outline) : null;
  if (!circle || !ellipse) throw new FractozoneError('BAD_BOUNDARY', 'the corrected outline cannot be fitted: it needs at least 5 points that are not on one line');
  const r: MeasureResult = structuredClone(base);
  const u = r.scale.umPerPx;
  const areaPx = polygonArea(outline);
  const sp = r.specimen;
  sp.outline = storedPolygon(outline);
  sp.center = storedPoint({ x: circle.cx, y: circle.cy });
  sp.radiusPx = round(circle.radiusPx, 3);
  sp.radiusUm = round(circle.radiusPx * u, 3);
  sp.circle = { cx: sp.center.x, cy: sp.center.y, radiusPx: sp.radiusPx, radiusUm: sp.radiusUm, rmsResidualPx: round(circle.rmsResidualPx, 4) };
  sp.ellipse = {
    cx: round(ellipse.cx, 3),
    cy: round(ellipse.cy, 3),
    semiMajorUm: round(ellipse.semiMajorPx * u, 3),
    semiMinorUm: round(ellipse.semiMinorPx * u, 3),
    angleDeg: round(ellipse.angleDeg, 3),
    rmsResidualPx: round(ellipse.rmsResidualPx, 4),
  };
  sp.areaMm2 = round((areaPx * r.scale.umPerPxX * r.scale.umPerPxY) / 1e6, 5);
  sp.equivalentRadiusUm = round(Math.sqrt(areaPx / Math.PI) * u, 3);
  r.warnings = mergeWarnings(r.warnings, [OUTLINE_CORRECTED]);
  return r;
}

/** Outcome of {@link recompute}: the result, or why a full run is needed. */
export type RecomputeOutcome = { kind: 'result'; result: MeasureResult } | { kind: 'full-run'; reason: string };

/**
 * The result for `params` (and an optional corrected outline) from the base result of a full run,
 * without touching the image. Equal to a full run with the same parameters (and, for an edited
 * boundary, to `measure --boundary`) up to the rounding noted at the top of this file.
 *
 * @param base - result of a full run with `boundaryPolygon` null
 * @param params - the complete current parameters (`boundaryPolygon` = an edited boundary, or null)
 * @param outline - a corrected outer edge (px), or null for the one found by the full run
 * @throws FractozoneError for bad parameters, a scale that cannot be set, or a bad material
 */
export function recompute(base: MeasureResult, params: MeasureParams, outline: readonly PointPx[] | null = null): RecomputeOutcome {
  const p = validateParams(structuredClone(params));
  const reason = fullRunReason(base, p);
  if (reason) return { kind: 'full-run', reason };
  let r = rescaleResult(base, p.scale);
  if (outline) r = withOutline(r, outline);
  return { kind: 'result', result: remeasure(r, p) };
}
