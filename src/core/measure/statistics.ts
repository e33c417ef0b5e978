/**
 * Summary statistics of a width profile (values in angular order), with confidence intervals
 * that respect the correlation between neighbouring rays.
 */
import { mean as ssMean, median as ssMedian, quantileSorted, sampleStandardDeviation, medianAbsoluteDeviation } from 'simple-statistics';
import { createRng } from '../random.js';
import { studentTInv } from './tdist.js';

/** Options of {@link widthStatistics}. */
export interface WidthStatisticsOptions {
  /** Seed of the bootstrap PRNG (default 1). */
  seed?: number;
  /** Number of bootstrap resamples for the CI of the median (default 2000; 0 → skip). */
  bootstrap?: number;
  /** Treat the profile as circular (last value neighbours the first) for the autocorrelation (default true). */
  circular?: boolean;
}

/** Result of {@link widthStatistics}; all lengths in the unit of the input values (µm in the tool). */
export interface WidthStatistics {
  /** Number of finite values used. */
  n: number;
  /** Effective sample size n/τ (integrated autocorrelation time τ, see effectiveSampleSizeOf). */
  nEff: number;
  /** Integrated autocorrelation time τ (rays). */
  tau: number;
  /** Lag-1 autocorrelation of the profile (pairs of neighbouring finite values). */
  rho1: number;
  mean: number;
  median: number;
  /** Sample standard deviation (n − 1). */
  sd: number;
  min: number;
  max: number;
  /** 5 % and 95 % quantiles (simple-statistics `quantileSorted` definition). */
  p05: number;
  p95: number;
  /** 95 % CI of the mean: mean ± t₀.₉₇₅(nEff − 1)·sd/√nEff. */
  ci95Mean: [number, number];
  /** Student t quantile used for ci95Mean. */
  tQuantile: number;
  /** Naive 95 % CI of the mean using n (for comparison only; too narrow for correlated rays). */
  ci95MeanNaive: [number, number];
  /** Seeded percentile-bootstrap 95 % interval of the median, blocks of round(τ) rays (null when bootstrap = 0 or n < 2). */
  ci95Median: [number, number] | null;
}

/** Median of the values (simple-statistics `median`; NaN when there are none). */
export function medianOf(values: readonly number[]): number {
  return values.length ? ssMedian(values as number[]) : NaN;
}

/**
 * Lag-k autocorrelation of an ordered profile. Non-finite entries are gaps: pairs across a gap
 * are skipped. ρ_k = [Σ(xᵢ−x̄)(xᵢ₊ₖ−x̄) / #pairs] / [Σ(xᵢ−x̄)² / n] (the usual estimator, e.g.
 * Box & Jenkins, Time Series Analysis, §2.1.5, rescaled to the number of available pairs).
 *
 * @param values - profile in angular order (NaN = gap)
 * @param lag - k ≥ 1
 * @param circular - whether the last value neighbours the first
 */
export function autocorrelation(values: readonly number[], lag: number, circular = true): number {
  const fin = values.filter((v) => Number.isFinite(v));
  if (fin.length < 3) return 0;
  const m = ssMean(fin);
  let den = 0;
  for (const v of fin) den += (v - m) * (v - m);
  if (den <= 0) return 0;
  let num = 0;
  let pairs = 0;
  const n = values.length;
  const last = circular ? n : n - lag;
  for (let i = 0; i < last; i++) {
    const a = values[i];
    const b = values[(i + lag) % n];
    if (Number.isFinite(a) && Number.isFinite(b)) {
      num += (a - m) * (b - m);
      pairs++;
    }
  }
  if (pairs === 0) return 0;
  return ((num / pairs) * fin.length) / den;
}

/** Lag-1 autocorrelation, see {@link autocorrelation}. */
export function lag1Autocorrelation(values: readonly number[], circular = true): number {
  return autocorrelation(values, 1, circular);
}

/**
 * Effective sample size n_eff = n / τ with the integrated autocorrelation time
 * τ = 1 + 2·Σ_{k≥1} ρ_k, the sum truncated before the first non-positive ρ_k (initial positive
 * sequence, Geyer, Statistical Science 7 (1992) 473; Sokal's integrated autocorrelation time).
 * For an AR(1) profile this equals n·(1−ρ₁)/(1+ρ₁) (Wilks, Statistical Methods in the Atmospheric
 * Sciences, 3rd ed., eq. 5.12); for a smooth periodic profile (an ellipse, a lobed boundary) it
 * counts about one independent value per half-lobe instead of collapsing to ~1. Clamped to
 * [min(n, 2), n].
 *
 * @param values - profile in angular order (NaN = gap)
 * @param circular - whether the profile wraps around
 * @returns { nEff, tau }
 */
export function effectiveSampleSizeOf(values: readonly number[], circular = true): { nEff: number; tau: number } {
  const n = values.filter((v) => Number.isFinite(v)).length;
  if (n < 3) return { nEff: n, tau: 1 };
  let tau = 1;
  const maxLag = Math.floor(values.length / 2);
  for (let k = 1; k < maxLag; k++) {
    const r = autocorrelation(values, k, circular);
    if (!(r > 0)) break;
    tau += 2 * r;
  }
  return { nEff: Math.min(n, Math.max(Math.min(n, 2), n / tau)), tau };
}

/**
 * AR(1) effective sample size n·(1−ρ₁)/(1+ρ₁) (Wilks, eq. 5.12); negative ρ₁ is taken as 0, the
 * result is clamped to [min(n, 2), n].
 *
 * @param n - number of values
 * @param rho1 - lag-1 autocorrelation
 */
export function effectiveSampleSize(n: number, rho1: number): number {
  const r = Math.min(Math.max(rho1, 0), 0.999999);
  const ne = (n * (1 - r)) / (1 + r);
  return Math.min(n, Math.max(Math.min(n, 2), ne));
}

/**
 * Robust outlier flags: |x − median| > k·1.4826·MAD (MAD about the median; 1.4826 makes the
 * MAD a consistent estimator of σ for normal data — Rousseeuw & Croux, JASA 88 (1993) 1273;
 * k = 3.5 follows Iglewicz & Hoaglin, How to Detect and Handle Outliers, ASQC 1993).
 * Non-finite values are never flagged. When MAD = 0 nothing is flagged.
 *
 * @param values - data (any unit)
 * @param k - threshold in robust standard deviations (default 3.5)
 */
export function robustOutlierFlags(values: readonly number[], k = 3.5): boolean[] {
  const fin = values.filter((v) => Number.isFinite(v));
  if (fin.length < 3) return values.map(() => false);
  const med = ssMedian(fin);
  const mad = medianAbsoluteDeviation(fin);
  if (!(mad > 0)) return values.map(() => false);
  const lim = k * 1.4826 * mad;
  return values.map((v) => Number.isFinite(v) && Math.abs(v - med) > lim);
}

/** k-th smallest (0-based) of a by Hoare's quickselect (in place, deterministic middle pivot). */
export function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

/** The value at rank round(p·(n − 1)) of the sorted values, by {@link select} on a copy (NaN when empty). */
export function valueAtRank(values: Float32Array | Float64Array | number[], p: number): number {
  const a = Float64Array.from(values);
  if (a.length === 0) return NaN;
  return select(a, Math.min(a.length - 1, Math.max(0, Math.round(p * (a.length - 1)))));
}

/**
 * Median of the resample holding count[j] copies of sorted[j] (sorted ascending): the values of
 * ranks lo and hi (equal for an odd size), averaged for an even size.
 */
function bootstrapMedian(sorted: Float64Array, count: Int32Array, lo: number, hi: number): number {
  let cum = 0;
  let j = 0;
  while (cum + count[j] <= lo) cum += count[j++];
  const a = sorted[j];
  if (lo === hi) return a;
  while (cum + count[j] <= hi) cum += count[j++];
  return 0.5 * (a + sorted[j]);
}

/**
 * For each value (in its own order) its rank among the values sorted ascending, i.e. the index in
 * the sorted copy that holds the same number; tied values get distinct ranks of their tie.
 */
function ranksOf(values: readonly number[]): Int32Array {
  const n = values.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b] || a - b);
  const rank = new Int32Array(n);
  for (let r = 0; r < n; r++) rank[order[r]] = r;
  return rank;
}

/**
 * One circular block-bootstrap resample of n values as counts per rank: blocks of `block`
 * consecutive values (angular order, wrapping round) from uniform random starts until n values
 * are drawn, the last block cut short (Politis & Romano, "A circular block-resampling procedure
 * for stationary data", in Exploring the Limits of Bootstrap, Wiley 1992; Künsch, Ann. Statist.
 * 17 (1989) 1217).
 */
function blockResampleCounts(rank: Int32Array, block: number, rnd: () => number, count: Int32Array): void {
  const n = rank.length;
  let drawn = 0;
  while (drawn < n) {
    const start = Math.floor(rnd() * n);
    const len = Math.min(block, n - drawn);
    for (let k = 0; k < len; k++) count[rank[(start + k) % n]]++;
    drawn += len;
  }
}

/**
 * Statistics of a width profile: n, mean, median, sample sd, min, max, p05/p95
 * (simple-statistics), a 95 % CI of the mean with Student t on the effective sample size
 * (see {@link effectiveSampleSizeOf}) and a seeded percentile-bootstrap 95 % CI of the median
 * (Efron & Tibshirani, An Introduction to the Bootstrap, 1993, §13.3). Neighbouring rays are
 * correlated, so the bootstrap draws blocks of round(τ) consecutive rays (τ the integrated
 * autocorrelation time behind the effective sample size; circular block bootstrap, see
 * {@link blockResampleCounts}); with τ < 1.5 it draws single values. Before 2026-12-03 it drew
 * single values always, which made the median's interval 6–12 times narrower than the mean's on
 * the rendered scenes (plain: 386.0–391.1 against 372.6–420.4 µm); with blocks it is 378.6–417.0 µm.
 *
 * @param values - widths in angular order (µm); NaN entries are ignored (gaps)
 * @param opts - seed, bootstrap count, circularity
 * @returns the statistics (NaN fields when there are no finite values)
 */
export function widthStatistics(values: readonly number[], opts: WidthStatisticsOptions = {}): WidthStatistics {
  const fin = values.filter((v) => Number.isFinite(v));
  const n = fin.length;
  if (n === 0) {
    return {
      n: 0, nEff: 0, tau: 1, rho1: 0, mean: NaN, median: NaN, sd: NaN, min: NaN, max: NaN, p05: NaN, p95: NaN,
      ci95Mean: [NaN, NaN], tQuantile: NaN, ci95MeanNaive: [NaN, NaN], ci95Median: null,
    };
  }
  const sorted = Float64Array.from(fin).sort();
  const sortedArr = Array.from(sorted);
  const mean = ssMean(fin);
  const median = ssMedian(fin);
  const sd = n > 1 ? sampleStandardDeviation(fin) : 0;
  const rho1 = lag1Autocorrelation(values, opts.circular ?? true);
  const { nEff, tau } = effectiveSampleSizeOf(values, opts.circular ?? true);
  let ci95Mean: [number, number] = [NaN, NaN];
  let ci95MeanNaive: [number, number] = [NaN, NaN];
  let tq = NaN;
  if (n > 1) {
    tq = studentTInv(0.975, Math.max(nEff - 1, 1));
    const h = (tq * sd) / Math.sqrt(nEff);
    // A profile with no negative value (widths: band.ts passes valid rays only, each ≥ minWidthPx)
    // has a non-negative process mean, so the lower end is cut at 0 — the cut interval covers that
    // mean at least as often (seen: −41.2–1674.0 µm on a defocused scene under a high light).
    const floor = sorted[0] >= 0 ? 0 : -Infinity;
    ci95Mean = [Math.max(floor, mean - h), mean + h];
    const tn = studentTInv(0.975, n - 1);
    const hn = (tn * sd) / Math.sqrt(n);
    ci95MeanNaive = [Math.max(floor, mean - hn), mean + hn];
  }
  const B = opts.bootstrap ?? 2000;
  let ci95Median: [number, number] | null = null;
  if (B > 0 && n >= 2) {
    const rng = createRng(opts.seed ?? 1);
    const rnd = (): number => rng.nextFloat();
    const meds = new Float64Array(B);
    // The resample is sorted[j] for drawn ranks j, and `sorted` is ascending: its middle values are
    // sorted[] at the middle drawn ranks, found by counting the ranks (the same numbers as the median
    // of the resampled values; 2000 resamples of 360 rays 34 → 10–14 ms, load 10, against selecting on the values).
    const count = new Int32Array(n);
    const lo = (n - 1) >> 1;
    const hi = n >> 1;
    const block = Math.max(1, Math.min(n, Math.round(tau)));
    const rank = block > 1 ? ranksOf(fin) : null;
    for (let b = 0; b < B; b++) {
      count.fill(0);
      // single rays are drawn as ranks directly (the numbers of the single-ray bootstrap before blocks)
      if (rank) blockResampleCounts(rank, block, rnd, count);
      else for (let i = 0; i < n; i++) count[Math.floor(rnd() * n)]++;
      meds[b] = bootstrapMedian(sorted, count, lo, hi);
    }
    meds.sort();
    const m = Array.from(meds);
    ci95Median = [quantileSorted(m, 0.025), quantileSorted(m, 0.975)];
  }
  return {
    n, nEff, tau, rho1, mean, median, sd,
    min: sorted[0], max: sorted[n - 1],
    p05: quantileSorted(sortedArr, 0.05), p95: quantileSorted(sortedArr, 0.95),
    ci95Mean, tQuantile: tq, ci95MeanNaive, ci95Median,
  };
}
