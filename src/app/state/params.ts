/**
 * Doc → MeasureParams: the one parameter object the engine (and the CLI) understands. The app and
 * the CLI give the same numbers for the same image and the same parameter object.
 */
import type { MaterialParams, MeasureParams, ScaleParams } from '../../core/pipeline/types.js';
import { defaultParams } from '../../core/pipeline/params.js';
import { checkFeatureNames } from '../../core/texture/registry.js';
import type { Doc, MaterialForm, Outline } from './document.js';
import type { PointPx } from '../../core/pipeline/types.js';

/** Default parameters: core's `defaultParams()`, so the app and the CLI start from the same object. */
export function baseParams(): MeasureParams {
  return defaultParams();
}

/**
 * The scale part of the parameters. `useMetadata` stays true (the CLI default) unless the user chose
 * "no scale": typed, two-point and bar scales take precedence over metadata anyway, so the same
 * choice gives the same parameter object as the CLI (e.g. `--bar-length 1000um`).
 */
export function scaleParamsOf(doc: Doc): ScaleParams {
  const s = doc.scale;
  switch (s.source) {
    case 'none':
      return { useMetadata: false };
    case 'metadata':
      return { useMetadata: true };
    case 'typed':
      return { useMetadata: true, pixelSizeUm: s.umPerPx };
    case 'two-point':
      return { useMetadata: true, twoPoint: { p0: { ...s.p0 }, p1: { ...s.p1 }, distanceUm: s.distanceUm } };
    case 'scale-bar':
      return { useMetadata: true, barLengthUm: s.barLengthUm };
  }
}

/**
 * Material form → MaterialParams (typed K_c and σ_0 with their sd), or null when the two are not
 * both given. A typed strain-rate law L = A·ε̇^B (µm) travels inside a material record, and a
 * material read from a sheet is passed whole (typed values override it, as on the command line).
 */
export function materialParamsOf(m: MaterialForm): MaterialParams | null {
  const hasTyped = m.toughnessMPaSqrtM !== null && m.strengthMPa !== null;
  if (!hasTyped && !m.sheet) return null;
  const out: MaterialParams = {};
  const source = 'typed in the app';
  if (m.toughnessMPaSqrtM !== null) out.toughness = { value: m.toughnessMPaSqrtM, ...(m.toughnessSdMPaSqrtM !== null ? { sd: m.toughnessSdMPaSqrtM } : {}), source };
  if (m.strengthMPa !== null) out.strength = { value: m.strengthMPa, ...(m.strengthSdMPa !== null ? { sd: m.strengthSdMPa } : {}), source };
  const base = m.sheet ?? null;
  if (base) out.material = structuredClone(base);
  if (m.rateLawA !== null && m.rateLawB !== null && hasTyped) {
    const mat = out.material ?? {
      name: m.name || 'typed in the app',
      invented: false,
      fractureToughness: { value: m.toughnessMPaSqrtM!, ...(m.toughnessSdMPaSqrtM !== null ? { sd: m.toughnessSdMPaSqrtM } : {}), unitWritten: 'MPa·√m', source },
      inherentStrength: { value: m.strengthMPa!, ...(m.strengthSdMPa !== null ? { sd: m.strengthSdMPa } : {}), unitWritten: 'MPa', source },
    };
    mat.dynamic = { ...(mat.dynamic ?? {}), L: { law: 'power', A: m.rateLawA, B: m.rateLawB, source } };
    out.material = mat;
  }
  return out;
}

/**
 * The full parameter object for a document. `withBoundary` sends the edited boundary polygon
 * (manual boundary, re-measured without re-segmenting).
 */
export function paramsOf(doc: Doc, opts: { withBoundary?: boolean } = {}): MeasureParams {
  const p = baseParams();
  p.scale = scaleParamsOf(doc);
  p.windowUm = doc.settings.windowUm;
  p.features = checkFeatureNames(doc.settings.features);
  p.nRays = doc.settings.nRays;
  p.dropOutliers = doc.settings.dropOutliers;
  p.outlierK = doc.settings.outlierK;
  p.bootstrap = doc.settings.bootstrap;
  p.seed = doc.settings.seed;
  p.exclude = doc.exclude.map(([a, b]) => [a, b] as [number, number]);
  p.material = materialParamsOf(doc.material);
  p.strainRatePerS = doc.material.strainRatePerS;
  p.reference = doc.material.reference;
  p.tolerancePct = doc.material.tolerancePct;
  if ((opts.withBoundary ?? doc.boundaryEdited) && doc.boundary && doc.boundary.length >= 3) p.boundaryPolygon = doc.boundary.map((q) => ({ x: q.x, y: q.y }));
  return p;
}

/** Polygon (px) of an ellipse outline, `n` vertices, counter-clockwise on screen from 0°. */
export function ellipsePolygon(o: Outline, n = 360): PointPx[] {
  const out: PointPx[] = [];
  const a = (o.angleDeg * Math.PI) / 180;
  const ca = Math.cos(a);
  const sa = Math.sin(a);
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    // ellipse in its own frame (x along the major axis), rotated CCW on screen by angleDeg
    const ex = o.rx * Math.cos(t);
    const ey = o.ry * Math.sin(t);
    out.push({ x: o.cx + ex * ca - ey * sa, y: o.cy - (ex * sa + ey * ca) });
  }
  return out;
}

/** Ellipse outline from a polygon: centroid, principal axes and semi-axes from the second moments. */
export function outlineFromPolygon(poly: PointPx[]): Outline | null {
  if (poly.length < 3) return null;
  let cx = 0;
  let cy = 0;
  for (const q of poly) {
    cx += q.x;
    cy += q.y;
  }
  cx /= poly.length;
  cy /= poly.length;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const q of poly) {
    const dx = q.x - cx;
    const dy = -(q.y - cy);
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  // second moments along the principal axes; for points spread evenly around an ellipse the mean
  // of cos² is 1/2, so the semi-axis is √(2·moment)
  let ma = 0;
  let mb = 0;
  for (const q of poly) {
    const dx = q.x - cx;
    const dy = -(q.y - cy);
    ma += (dx * c + dy * s) ** 2;
    mb += (-dx * s + dy * c) ** 2;
  }
  const ra = Math.sqrt((2 * ma) / poly.length);
  const rb = Math.sqrt((2 * mb) / poly.length);
  return { cx, cy, rx: ra, ry: rb, angleDeg: (angle * 180) / Math.PI };
}

/**
 * Moves a detected outline polygon with its ellipse handles: the affine map that takes the ellipse
 * `from` to the ellipse `to` (translate, rotate, stretch along the axes), applied to every vertex.
 * Keeps the real shape of the edge instead of replacing it with an ellipse.
 */
export function transformOutline(poly: readonly PointPx[], from: Outline, to: Outline): PointPx[] {
  const t0 = (from.angleDeg * Math.PI) / 180;
  const t1 = (to.angleDeg * Math.PI) / 180;
  const sa = from.rx > 0 ? to.rx / from.rx : 1;
  const sb = from.ry > 0 ? to.ry / from.ry : 1;
  const c0 = Math.cos(t0);
  const s0 = Math.sin(t0);
  const c1 = Math.cos(t1);
  const s1 = Math.sin(t1);
  return poly.map((p) => {
    const mx = p.x - from.cx;
    const my = -(p.y - from.cy); // y up (counter-clockwise on screen)
    const u = (mx * c0 + my * s0) * sa;
    const v = (-mx * s0 + my * c0) * sb;
    return { x: to.cx + u * c1 - v * s1, y: to.cy - (u * s1 + v * c1) };
  });
}

/** The outline polygon in use (px): the detected one, moved by the outline handles when edited. */
export function outlinePolygonOf(doc: Doc): PointPx[] | null {
  if (!doc.outlineEdited || !doc.outline) return doc.outerPolygon;
  const base = doc.outerPolygon ? outlineFromPolygon(doc.outerPolygon) : null;
  if (doc.outerPolygon && base) return transformOutline(doc.outerPolygon, base, doc.outline);
  return ellipsePolygon(doc.outline, Math.max(360, doc.settings.nRays));
}
