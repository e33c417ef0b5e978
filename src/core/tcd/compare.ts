/**
 * Comparison of a measured rim-band width with the critical distance, and the toughness implied by
 * a measured width.
 *
 * Ratio interval (documented choice, log-space delta method): each 95 % interval [lo, hi] of a
 * positive quantity is read as a log-normal one, sd_ln = ln(hi/lo)/(2·1.96); the width and L are
 * independent, so the ratio ρ = w/ref has sd_ln(ρ) = √(sd_ln,w² + sd_ln,L²) and the interval
 * ρ·exp(±1.96·sd_ln(ρ)). When the width interval reaches 0 or below (a degenerate measurement) the
 * linear form is used instead: relative sd = (hi−lo)/(2·1.96·value), interval ρ(1 ± 1.96·rel),
 * clipped at 0.
 *
 * Verdict rule, tolerance X (default 20 %), band [1−X, 1+X]:
 * - 'agrees'        the whole ratio interval lies inside the band;
 * - 'band-wider'    the whole interval lies above 1+X;
 * - 'band-narrower' the whole interval lies below 1−X;
 * - 'inconclusive'  otherwise (the interval straddles a band edge or is wider than the band).
 * An engineer can then say "agrees" only when the measurement is precise enough to show it.
 */
import { Z975 } from '../measure/tdist.js';
import { FractozoneError } from '../errors.js';

/**
 * Default tolerance ±20 %: common practice for TCD predictions (predictions within about ±20 % of
 * experiments are considered good), no single source.
 */
export const DEFAULT_TOLERANCE_PCT = 20;


/** Which TCD length the width is compared with. */
export type WidthReference = 'L' | 'L/2' | '2L';

const REF_FACTOR: Record<WidthReference, number> = { L: 1, 'L/2': 0.5, '2L': 2 };

/** Input of {@link compareWidthWithL}. */
export interface CompareInput {
  /** Measured band width: mean and 95 % confidence interval, µm. */
  widthUm: { mean: number; ci95: [number, number] };
  /** Critical distance, µm. */
  L_um: number;
  /** 95 % interval of L, µm (omit when L is taken as exact). */
  L_interval95_um?: [number, number] | null;
  /** Reference length (default 'L'). */
  reference?: WidthReference;
  /** Tolerance X in percent (default 20). */
  tolerancePct?: number;
}

/** Verdict of the comparison. */
export type Verdict = 'agrees' | 'band-wider' | 'band-narrower' | 'inconclusive';

/** Output of {@link compareWidthWithL}. */
export interface CompareResult {
  reference: WidthReference;
  referenceUm: number;
  ratio: number;
  ratioInterval95: [number, number];
  verdict: Verdict;
  tolerancePct: number;
  note: string;
}

function sdOf(value: number, ci: [number, number] | null | undefined, what: string): { log: boolean; sd: number } {
  if (!ci) return { log: true, sd: 0 };
  const [lo, hi] = ci;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo <= hi)) throw new FractozoneError('BAD_PARAMETER', `${what}: interval [${lo}, ${hi}] is not an ordered pair of numbers`);
  if (!(lo <= value * (1 + 1e-12) && value <= hi * (1 + 1e-12))) throw new FractozoneError('BAD_PARAMETER', `${what}: value ${value} lies outside its interval [${lo}, ${hi}]`);
  if (lo > 0) return { log: true, sd: Math.log(hi / lo) / (2 * Z975) };
  return { log: false, sd: (hi - lo) / (2 * Z975 * value) };
}

/**
 * Compare a measured band width with L, L/2 or 2L (see the module note for the interval and the rule).
 * @param input width (µm, mean and 95 % CI), L (µm, optional 95 % interval), reference, tolerance
 * @returns ratio width/reference with its 95 % interval, the verdict and a one-sentence note
 */
export function compareWidthWithL(input: CompareInput): CompareResult {
  const reference = input.reference ?? 'L';
  if (!(reference in REF_FACTOR)) throw new FractozoneError('BAD_PARAMETER', `reference must be L, L/2 or 2L, got "${String(reference)}"`);
  const X = input.tolerancePct ?? DEFAULT_TOLERANCE_PCT;
  if (!(Number.isFinite(X) && X > 0 && X < 100)) throw new FractozoneError('BAD_PARAMETER', `tolerance must be between 0 and 100 %, got ${X}`);
  const w = input.widthUm.mean;
  if (!(Number.isFinite(w) && w > 0)) throw new FractozoneError('BAD_PARAMETER', `band width must be positive, got ${w} µm`);
  if (!(Number.isFinite(input.L_um) && input.L_um > 0)) throw new FractozoneError('BAD_PARAMETER', `critical distance must be positive, got ${input.L_um} µm`);
  const refUm = input.L_um * REF_FACTOR[reference];
  const ratio = w / refUm;
  const sw = sdOf(w, input.widthUm.ci95, 'band width');
  const sl = sdOf(input.L_um, input.L_interval95_um, 'critical distance');
  const sd = Math.hypot(sw.sd, sl.sd);
  const interval: [number, number] =
    sw.log && sl.log ? [ratio * Math.exp(-Z975 * sd), ratio * Math.exp(Z975 * sd)] : [Math.max(0, ratio * (1 - Z975 * sd)), ratio * (1 + Z975 * sd)];
  const lo = 1 - X / 100;
  const hi = 1 + X / 100;
  let verdict: Verdict;
  if (interval[0] >= lo && interval[1] <= hi) verdict = 'agrees';
  else if (interval[0] > hi) verdict = 'band-wider';
  else if (interval[1] < lo) verdict = 'band-narrower';
  else verdict = 'inconclusive';
  const f = (v: number): string => v.toFixed(2);
  const span = `width/${reference} = ${f(ratio)} (95 % interval ${f(interval[0])}–${f(interval[1])}), tolerance band ${f(lo)}–${f(hi)}`;
  const note: Record<Verdict, string> = {
    agrees: `The band width agrees with ${reference} within ±${X} %: ${span}.`,
    'band-wider': `The band is wider than ${reference} by more than ${X} %: ${span}.`,
    'band-narrower': `The band is narrower than ${reference} by more than ${X} %: ${span}.`,
    inconclusive:
      interval[1] - interval[0] > hi - lo
        ? `Inconclusive: the ratio interval is wider than the tolerance band; ${span}.`
        : `Inconclusive: the ratio interval straddles an edge of the tolerance band; ${span}.`,
  };
  return { reference, referenceUm: refUm, ratio, ratioInterval95: interval, verdict, tolerancePct: X, note: note[verdict] };
}

/** Toughness implied by a band width: K in MPa·√m, its 95 % interval, and the L the width stands for (µm). */
export interface ImpliedToughness {
  K_MPa_sqrtm: number;
  interval95_MPa_sqrtm: [number, number] | null;
  L_um: number;
}

/**
 * Fracture toughness implied by a measured band width, taking the width as the reference length
 * (L, L/2 or 2L): L = w / factor and K = σ_0·√(π·L) (inverse of L = (1/π)(K/σ_0)², Taylor 2007).
 * Interval: log-space delta method, sd_ln K = √(sd_ln σ² + (sd_ln w / 2)²).
 * @param widthUm band width, µm, with optional 95 % CI
 * @param sigma0_MPa inherent strength, MPa
 * @param options `sigma0Sd_MPa` (sd of σ_0, MPa), `reference` (default 'L')
 * @returns K in MPa·√m and its 95 % interval (null when no scatter is given)
 */
export function impliedToughness(
  widthUm: { mean: number; ci95?: [number, number] | null },
  sigma0_MPa: number,
  options: { sigma0Sd_MPa?: number; reference?: WidthReference } = {},
): ImpliedToughness {
  const reference = options.reference ?? 'L';
  if (!(Number.isFinite(widthUm.mean) && widthUm.mean > 0)) throw new FractozoneError('BAD_PARAMETER', `band width must be positive, got ${widthUm.mean} µm`);
  if (!(Number.isFinite(sigma0_MPa) && sigma0_MPa > 0)) throw new FractozoneError('BAD_PARAMETER', `inherent strength must be positive, got ${sigma0_MPa} MPa`);
  const L_um = widthUm.mean / REF_FACTOR[reference];
  const K = sigma0_MPa * Math.sqrt(Math.PI * L_um * 1e-6);
  const sw = sdOf(widthUm.mean, widthUm.ci95, 'band width');
  const sdS = options.sigma0Sd_MPa ?? 0;
  if (!(Number.isFinite(sdS) && sdS >= 0)) throw new FractozoneError('BAD_PARAMETER', `sd of σ_0 must be ≥ 0, got ${sdS}`);
  const relS = sdS / sigma0_MPa;
  const sd = Math.hypot(relS, sw.sd / 2);
  const interval95: [number, number] | null = sd === 0 ? null : [K * Math.exp(-Z975 * sd), K * Math.exp(Z975 * sd)];
  return { K_MPa_sqrtm: K, interval95_MPa_sqrtm: interval95, L_um };
}
