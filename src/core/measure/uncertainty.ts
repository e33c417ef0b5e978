/**
 * The measurement interval of a band's circumferential mean width: how far the mean of THIS
 * specimen can be off because of where the boundary and the outer edge were placed and because of
 * the scale. The circumference is measured whole, so the mean is a census of the profile, not a
 * sample of it; its uncertainty is that of the placement, not the spread of w(θ).
 *
 * Model (every term a standard uncertainty of the mean width, µm; the sources independent):
 * - **Boundary localisation**: a random part and a systematic part.
 *   Random: the per-ray residual of the boundary radius around its own running median
 *   (15 rays, circular), r_i = R_i − med₁₅(R)_i; its standard deviation s is the per-ray placement
 *   scatter, and the residuals are correlated along the circumference: with τ the integrated
 *   autocorrelation time of r (statistics.ts `effectiveSampleSizeOf`, the same estimator as the
 *   circumferential interval) the mean of n rays has u = s·√(τ/n), not s/√n.
 *   Systematic: a shift common to all rays (the level of the step fit, the texture window's
 *   blur), given by the caller (`systematicSdUm`) — see the pipeline's uncertainty stage for the
 *   figures it uses.
 * - **Outer-edge localisation**: the same two parts on the outer radius.
 * - **Scale**: u = mean · relative sd of the pixel size (see {@link scaleRelativeSd}).
 * Combined u = √(Σ u²); the interval mean ± 1.96·u (normal, coverage factor 1.96). Each source's
 * share is u²/Σu² in percent, so the shares sum to 100.
 *
 * Assumptions: boundary, outer edge and scale errors are independent; the residual around a
 * 15-ray running median is placement scatter, not a real feature of the boundary narrower than
 * 15° (a real wiggle that narrow counts as scatter, which widens the interval, the safe side);
 * the systematic parts are the caller's stated figures.
 */
import { Z975 } from './tdist.js';
import { effectiveSampleSizeOf } from './statistics.js';

/** 95 % coverage factor of a normal distribution. */
export const COVERAGE_FACTOR_95 = Z975;

/** Rays of the running median the residual profile is taken around. */
export const RESIDUAL_MEDIAN_RAYS = 15;

/** One localisation source of the budget. */
export interface LocalisationTerm {
  /** Standard uncertainty of the mean width from this source, µm. */
  sdUm: number;
  /** Its random part, s·√(τ/n), µm. */
  randomSdUm: number;
  /** Its systematic part (common to every ray), µm. */
  systematicSdUm: number;
  /** Per-ray placement scatter s, µm. */
  perRaySdUm: number;
  /** Integrated autocorrelation time τ of the residual profile, rays. */
  correlationRays: number;
}

function circularMedian(v: readonly number[], k: number): number[] {
  const n = v.length;
  const h = Math.floor(k / 2);
  return v.map((_, i) => {
    const w: number[] = [];
    for (let j = -h; j <= h; j++) w.push(v[(((i + j) % n) + n) % n]);
    w.sort((a, b) => a - b);
    const m = w.length >> 1;
    return w.length % 2 ? w[m] : 0.5 * (w[m - 1] + w[m]);
  });
}

/**
 * One localisation term from the radii (µm) of the valid rays in angular order.
 * @param radiiUm - radius of the boundary or of the outer edge on each valid ray, µm, in ray order
 * @param systematicSdUm - standard uncertainty common to all rays, µm (≥ 0)
 */
export function localisationTerm(radiiUm: readonly number[], systematicSdUm: number): LocalisationTerm {
  const n = radiiUm.length;
  if (n < 3) return { sdUm: systematicSdUm, randomSdUm: 0, systematicSdUm, perRaySdUm: 0, correlationRays: 1 };
  const med = circularMedian(radiiUm, Math.min(RESIDUAL_MEDIAN_RAYS, n - (1 - (n % 2))));
  const res = radiiUm.map((r, i) => r - med[i]);
  const m = res.reduce((a, b) => a + b, 0) / n;
  const s = Math.sqrt(res.reduce((a, b) => a + (b - m) ** 2, 0) / Math.max(1, n - 1));
  const tau = s > 0 ? Math.max(1, effectiveSampleSizeOf(res, true).tau) : 1;
  const randomSdUm = s * Math.sqrt(Math.min(tau, n) / n);
  return { sdUm: Math.hypot(randomSdUm, systematicSdUm), randomSdUm, systematicSdUm, perRaySdUm: s, correlationRays: tau };
}

/** Where the scale came from, as far as its uncertainty is concerned. */
export interface ScaleUncertaintyInput {
  source: 'typed' | 'two-point' | 'metadata' | 'scale-bar';
  /** Length of the detected bar in px (scale-bar source). */
  barLengthPx?: number | null;
  /** Distance of the two points in px (two-point source). */
  twoPointDistancePx?: number | null;
  /** Tolerance of a typed or metadata pixel size: half-width of its 95 % interval, percent. */
  pixelSizeTolerancePct: number;
}

/**
 * Standard uncertainty of each end of a scale bar or of a clicked point, px. A bar's end is found
 * on the thresholded bar to about half a pixel (bounds ±0.5 px read as a uniform distribution:
 * 0.5/√3 ≈ 0.29 px, rounded up); a common-practice figure, no source.
 */
export const SCALE_END_SD_PX = 0.3;

/** Relative standard uncertainty of the pixel size, and a one-line account of it. */
export function scaleRelativeSd(s: ScaleUncertaintyInput): { relSd: number; detail: string } {
  const ends = (lengthPx: number, what: string): { relSd: number; detail: string } => {
    const rel = (Math.SQRT2 * SCALE_END_SD_PX) / lengthPx;
    return { relSd: rel, detail: `${what} ${lengthPx.toFixed(1)} px, each end ±${SCALE_END_SD_PX} px (sd): ${(100 * rel).toFixed(2)} %` };
  };
  if (s.source === 'scale-bar' && s.barLengthPx && s.barLengthPx > 0) return ends(s.barLengthPx, 'scale bar');
  if (s.source === 'two-point' && s.twoPointDistancePx && s.twoPointDistancePx > 0) return ends(s.twoPointDistancePx, 'two points');
  const rel = s.pixelSizeTolerancePct / 100 / COVERAGE_FACTOR_95;
  return { relSd: rel, detail: `${s.source === 'metadata' ? 'metadata' : 'typed'} pixel size ±${s.pixelSizeTolerancePct} % (95 %)` };
}

/** The budget of the measurement interval: each source's standard uncertainty and share. */
export interface MeasurementBudget {
  boundary: LocalisationTerm & { sharePct: number };
  outerEdge: LocalisationTerm & { sharePct: number };
  scale: { sdUm: number; relativeSdPct: number; sharePct: number; detail: string };
  /** √(Σ u²), µm. */
  combinedSdUm: number;
  coverageFactor: number;
}

/** The interval mean ± k·u and its budget. */
export function measurementInterval(
  meanUm: number,
  boundary: LocalisationTerm,
  outerEdge: LocalisationTerm,
  scale: { relSd: number; detail: string },
): { ci95Um: [number, number]; budget: MeasurementBudget } {
  const su = Math.abs(meanUm) * scale.relSd;
  const v = boundary.sdUm ** 2 + outerEdge.sdUm ** 2 + su ** 2;
  const u = Math.sqrt(v);
  const share = (x: number): number => (v > 0 ? (100 * x * x) / v : 0);
  const k = COVERAGE_FACTOR_95;
  return {
    ci95Um: [meanUm - k * u, meanUm + k * u],
    budget: {
      boundary: { ...boundary, sharePct: share(boundary.sdUm) },
      outerEdge: { ...outerEdge, sharePct: share(outerEdge.sdUm) },
      scale: { sdUm: su, relativeSdPct: 100 * scale.relSd, sharePct: share(su), detail: scale.detail },
      combinedSdUm: u,
      coverageFactor: k,
    },
  };
}
