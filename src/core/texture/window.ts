/**
 * Physical texture window: from µm to an odd pixel count, and the default window size rule.
 */
import { FractozoneError } from '../errors.js';

/** Smallest and largest default window side at working resolution (px). */
export const DEFAULT_WINDOW_MIN_PX = 7;
export const DEFAULT_WINDOW_MAX_PX = 31;
/** Default window side as a fraction of the specimen radius. */
export const DEFAULT_WINDOW_RADIUS_FRACTION = 1 / 25;

/** A default-window rule: a fraction of the specimen radius, clamped to a px range at working resolution. */
export interface WindowRule {
  readonly radiusFraction: number;
  readonly minPx: number;
  readonly maxPx: number;
}

/** The rule every registered feature uses (see {@link defaultWindowUm}). */
export const DEFAULT_WINDOW_RULE: WindowRule = {
  radiusFraction: DEFAULT_WINDOW_RADIUS_FRACTION,
  minPx: DEFAULT_WINDOW_MIN_PX,
  maxPx: DEFAULT_WINDOW_MAX_PX,
};
/** Specimen radius assumed when unknown, as a fraction of the smaller image side. */
export const ASSUMED_RADIUS_FRACTION_OF_IMAGE = 0.4;

/**
 * Window side in pixels for a physical window: the odd integer nearest to windowUm / umPerPx
 * (ties go up), at least 3.
 *
 * @param windowUm window side in µm (> 0)
 * @param umPerPx pixel size in µm per px (> 0) at the resolution where the feature is computed
 * @returns odd window side in px, ≥ 3
 */
export function windowPxFromUm(windowUm: number, umPerPx: number): number {
  if (!(Number.isFinite(windowUm) && windowUm > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `the texture window must be a positive length in µm, got ${windowUm}`);
  }
  if (!(Number.isFinite(umPerPx) && umPerPx > 0)) {
    throw new FractozoneError('BAD_SCALE', `the pixel size must be a positive number of µm per px, got ${umPerPx}`);
  }
  const n = windowUm / umPerPx;
  const odd = 2 * Math.floor((n - 1) / 2 + 0.5) + 1;
  return Math.max(3, odd);
}

/** Inputs of {@link defaultWindowUm}. */
export interface DefaultWindowInput {
  /** Pixel size of the full-resolution image, µm per px. */
  umPerPx: number;
  /** Specimen radius in µm if known (e.g. from the outline); otherwise estimated from the image size. */
  specimenRadiusUm?: number;
  /** Image size in px (full resolution); needed when `specimenRadiusUm` is absent. */
  imageWidthPx?: number;
  imageHeightPx?: number;
  /** Full-resolution px per working px (≥ 1) when features are computed on a downsampled image; default 1. */
  scaleFactor?: number;
  /** The rule (default {@link DEFAULT_WINDOW_RULE}). */
  rule?: WindowRule;
}

/**
 * Default texture window side in µm.
 *
 * Rule (common practice, no source): the window is 1/25 of the specimen radius, clamped so that it
 * spans 7..31 px at working resolution. 1/25 of the radius keeps the window well inside a rim band
 * of a few % of the radius while holding enough pixels for stable statistics; 7 px is the least
 * for a meaningful histogram, 31 px bounds the blur of the boundary. When the radius is unknown it
 * is taken as 0.4 × the smaller image side (a specimen that nearly fills the frame).
 *
 * @returns window side in µm (convert with {@link windowPxFromUm} at the working pixel size)
 */
export function defaultWindowUm(input: DefaultWindowInput): number {
  const { umPerPx } = input;
  const f = input.scaleFactor ?? 1;
  if (!(Number.isFinite(umPerPx) && umPerPx > 0)) {
    throw new FractozoneError('BAD_SCALE', `the pixel size must be a positive number of µm per px, got ${umPerPx}`);
  }
  if (!(Number.isFinite(f) && f >= 1)) {
    throw new FractozoneError('BAD_PARAMETER', `the working scale factor must be a number ≥ 1, got ${f}`);
  }
  let radiusUm = input.specimenRadiusUm;
  if (radiusUm === undefined) {
    const w = input.imageWidthPx;
    const h = input.imageHeightPx;
    if (!(w !== undefined && h !== undefined && Number.isFinite(w) && Number.isFinite(h) && w > 0 && h > 0)) {
      throw new FractozoneError('BAD_PARAMETER', 'the default texture window needs the specimen radius or the image size');
    }
    radiusUm = ASSUMED_RADIUS_FRACTION_OF_IMAGE * Math.min(w, h) * umPerPx;
  }
  if (!(Number.isFinite(radiusUm) && radiusUm > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `the specimen radius must be a positive length in µm, got ${radiusUm}`);
  }
  const rule = input.rule ?? DEFAULT_WINDOW_RULE;
  const workUmPerPx = umPerPx * f;
  const px = Math.min(rule.maxPx, Math.max(rule.minPx, (radiusUm * rule.radiusFraction) / workUmPerPx));
  return px * workUmPerPx;
}
