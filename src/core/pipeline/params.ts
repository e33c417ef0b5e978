/**
 * Default measurement parameters and their validation. The parameter object is plain JSON so the
 * CLI, the batch runner and the web app build the same thing and the result echoes it whole.
 */
import { FractozoneError } from '../errors.js';
import { checkFeatureNames, DEFAULT_FEATURES } from '../texture/registry.js';
import type { MeasureParams } from './types.js';

export { DEFAULT_FEATURES };

export function defaultParams(): MeasureParams {
  return {
    scale: { useMetadata: true },
    windowUm: null,
    features: [...DEFAULT_FEATURES],
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

function bad(message: string): never {
  throw new FractozoneError('BAD_PARAMETER', message);
}

function positive(v: number | undefined, what: string): void {
  if (v === undefined) return;
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) bad(`${what} must be a positive number, got ${String(v)}`);
}

/** Checks a parameter object and returns it; throws BAD_PARAMETER naming the offending field. */
export function validateParams(p: MeasureParams): MeasureParams {
  positive(p.scale.pixelSizeUm, 'pixel size (µm)');
  positive(p.scale.pixelSizeYUm, 'pixel size Y (µm)');
  positive(p.scale.barLengthUm, 'scale bar length (µm)');
  if (p.scale.twoPoint) {
    const t = p.scale.twoPoint;
    positive(t.distanceUm, 'two-point distance (µm)');
    for (const v of [t.p0.x, t.p0.y, t.p1.x, t.p1.y]) if (!Number.isFinite(v)) bad('two-point scale: coordinates must be finite numbers');
  }
  if (p.windowUm !== null) positive(p.windowUm, 'texture window (µm)');
  positive(p.sectionDiameterUm, 'section diameter (µm)');
  if (!Array.isArray(p.features) || p.features.length === 0) bad('at least one roughness feature is needed');
  checkFeatureNames(p.features);
  if (!Number.isInteger(p.nRays) || p.nRays < 8 || p.nRays > 36000) bad(`number of rays must be an integer 8..36000, got ${p.nRays}`);
  for (const s of p.exclude) {
    if (!Array.isArray(s) || s.length !== 2 || !s.every((v) => Number.isFinite(v))) bad('exclusion sectors must be pairs of angles in degrees');
  }
  positive(p.outlierK, 'outlier threshold k');
  if (!Number.isInteger(p.bootstrap) || p.bootstrap < 0 || p.bootstrap > 1_000_000) bad(`bootstrap resamples must be an integer 0..1000000, got ${p.bootstrap}`);
  if (!Number.isInteger(p.seed)) bad(`seed must be an integer, got ${p.seed}`);
  if (!Number.isFinite(p.maxPixels) || p.maxPixels < 1) bad('pixel budget must be a positive number of pixels');
  if (p.strainRatePerS !== null) positive(p.strainRatePerS, 'strain rate (1/s)');
  if (!['L', 'L/2', '2L'].includes(p.reference)) bad(`reference must be L, L/2 or 2L, got ${p.reference}`);
  positive(p.tolerancePct, 'tolerance (%)');
  if (p.boundaryPolygon !== null) {
    if (!Array.isArray(p.boundaryPolygon) || p.boundaryPolygon.length < 3) {
      throw new FractozoneError('BAD_BOUNDARY', 'a boundary polygon needs at least 3 points');
    }
    for (const [i, q] of p.boundaryPolygon.entries()) {
      if (!q || !Number.isFinite(q.x) || !Number.isFinite(q.y)) {
        throw new FractozoneError('BAD_BOUNDARY', `boundary polygon point ${i} is not {x, y} with finite numbers`);
      }
    }
  }
  return p;
}

/** Canonical JSON (sorted keys) so equal parameters give equal text — used for resume checks. */
export function canonicalJson(v: unknown): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
  const o = v as Record<string, unknown>;
  return `{${Object.keys(o)
    .filter((k) => o[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`)
    .join(',')}}`;
}
