/**
 * Doc → MeasureParams: the one parameter object the engine (and the CLI) understands. The app and
 * the CLI give the same numbers for the same image and the same parameter object.
 */
import type { MaterialParams, MeasureParams, ScaleParams } from '../../core/pipeline/types.js';
import type { Doc, MaterialForm, Outline } from './document.js';
import type { PointPx } from '../../core/pipeline/types.js';

/** Default parameters, identical to core's `defaultParams()` (checked in tests/app/params.test.ts). */
export function baseParams(): MeasureParams {
  return {
    scale: { useMetadata: true },
    windowUm: null,
    features: ['localStd', 'localEntropy', 'gradientEnergy'],
    nRays: 360,
    exclude: [],
    dropOutliers: false,
    outlierK: 3.5,
    bootstrap: 2000,
    seed: 1,
    boundaryPolygon: null,
    maxPixels: 100_000_000,
    material: null,
    strainRatePerS: null,
    reference: 'L',
    tolerancePct: 20,
  };
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
  p.features = [...doc.settings.features];
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

/** Ellipse outline from a polygon: centroid and mean radii along the principal axes (moments). */
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
  let ra = 0;
  let rb = 0;
  for (const q of poly) {
    const dx = q.x - cx;
    const dy = -(q.y - cy);
    ra = Math.max(ra, Math.abs(dx * c + dy * s));
    rb = Math.max(rb, Math.abs(-dx * s + dy * c));
  }
  return { cx, cy, rx: ra, ry: rb, angleDeg: (angle * 180) / Math.PI };
}
