/**
 * Uncertainty of the critical distance L = (1/π)(K_c/σ_0)² from scattered K_c and σ_0.
 *
 * Monte Carlo: independent draws of K_c and σ_0 (normal truncated to > 0 by rejection, or uniform on
 * an interval), seeded mulberry32 stream ({@link createRng}), L for each pair, then the median and the
 * 2.5 / 97.5 percentiles (linear interpolation, Hyndman–Fan type 7).
 *
 * First order (delta method, e.g. JCGM 100:2008 "GUM" §5.1 law of propagation of uncertainty for a
 * product of powers): relative sd of L ≈ 2·√((sd_K/K)² + (sd_σ/σ)²); interval L·(1 ± 1.96·rel. sd).
 * A uniform interval [lo, hi] enters with mean (lo+hi)/2 and sd (hi−lo)/√12.
 */
import { Z975 } from '../measure/tdist.js';
import { FractozoneError } from '../errors.js';
import { createRng, percentileSorted, type Rng } from '../random.js';
import { criticalDistance } from './criticalDistance.js';

/** A scattered input: normal (mean ± sd, truncated at > 0) or uniform on [lo, hi]. */
export type Scatter = { mean: number; sd: number } | { lo: number; hi: number };

/** Mean and standard deviation of a scatter description. */
export function scatterMoments(s: Scatter): { mean: number; sd: number } {
  if ('mean' in s) return { mean: s.mean, sd: s.sd };
  return { mean: (s.lo + s.hi) / 2, sd: (s.hi - s.lo) / Math.sqrt(12) };
}

function checkScatter(s: Scatter, what: string): void {
  if ('mean' in s) {
    if (!(Number.isFinite(s.mean) && s.mean > 0)) throw new FractozoneError('BAD_PARAMETER', `${what}: mean must be positive, got ${s.mean}`);
    if (!(Number.isFinite(s.sd) && s.sd >= 0)) throw new FractozoneError('BAD_PARAMETER', `${what}: standard deviation must be ≥ 0, got ${s.sd}`);
  } else {
    if (!(Number.isFinite(s.lo) && Number.isFinite(s.hi) && s.lo > 0 && s.hi >= s.lo)) {
      throw new FractozoneError('BAD_PARAMETER', `${what}: interval must satisfy 0 < low ≤ high, got [${s.lo}, ${s.hi}]`);
    }
  }
}

function draw(s: Scatter, rng: Rng): number {
  if ('mean' in s) {
    if (s.sd === 0) return s.mean;
    for (let k = 0; k < 1000; k++) {
      const v = s.mean + s.sd * rng.normal();
      if (v > 0) return v;
    }
    throw new FractozoneError('BAD_PARAMETER', `scatter sd ${s.sd} is so large against mean ${s.mean} that positive values are not found`);
  }
  return rng.uniform(s.lo, s.hi);
}

/** Result of {@link criticalDistanceUncertainty}. */
export interface DistanceUncertainty {
  /** L at the mean inputs, µm. */
  L_um: number;
  /** Monte Carlo median and 2.5/97.5 percentiles, µm. */
  median_um: number;
  interval95_um: [number, number];
  /** First-order (delta method) interval, µm, and relative sd of L. */
  deltaInterval95_um: [number, number];
  deltaRelativeSd: number;
  draws: number;
  seed: number;
}

/**
 * Seeded Monte Carlo and first-order intervals of L.
 * @param toughness K_c scatter in MPa·√m
 * @param strength σ_0 scatter in MPa
 * @param options `draws` (default 20 000) and `seed` (default 1)
 * @returns median and 95 % interval of L in µm, and the delta-method interval for comparison
 */
export function criticalDistanceUncertainty(
  toughness: Scatter,
  strength: Scatter,
  options: { draws?: number; seed?: number } = {},
): DistanceUncertainty {
  checkScatter(toughness, 'fracture toughness');
  checkScatter(strength, 'inherent strength');
  const draws = options.draws ?? 20000;
  const seed = options.seed ?? 1;
  if (!(Number.isInteger(draws) && draws >= 100 && draws <= 10_000_000)) {
    throw new FractozoneError('BAD_PARAMETER', `number of draws must be an integer between 100 and 10 000 000, got ${draws}`);
  }
  const rng = createRng(seed);
  const L = new Float64Array(draws);
  for (let i = 0; i < draws; i++) {
    const k = draw(toughness, rng);
    const s = draw(strength, rng);
    const r = k / s;
    L[i] = ((r * r) / Math.PI) * 1e6;
  }
  L.sort();
  const mk = scatterMoments(toughness);
  const ms = scatterMoments(strength);
  const L0 = criticalDistance(mk.mean, ms.mean).L_um;
  const rel = 2 * Math.sqrt((mk.sd / mk.mean) ** 2 + (ms.sd / ms.mean) ** 2);
  return {
    L_um: L0,
    median_um: percentileSorted(L, 50),
    interval95_um: [percentileSorted(L, 2.5), percentileSorted(L, 97.5)],
    deltaInterval95_um: [L0 * (1 - Z975 * rel), L0 * (1 + Z975 * rel)],
    deltaRelativeSd: rel,
    draws,
    seed: rng.seed,
  };
}
