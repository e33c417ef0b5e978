/**
 * Strain-rate dependence of the critical distance and the inherent strength.
 *
 * Power law: y(ε̇) = A·ε̇^B (ε̇ in 1/s), fitted by ordinary least squares of ln y on ln ε̇
 * (`simple-statistics` linearRegression / rSquared). Standard errors and the 95 % confidence
 * interval of the fitted mean use the textbook formulas of simple linear regression (e.g.
 * D.C. Montgomery, G.C. Runger, Applied Statistics and Probability for Engineers, ch. 11):
 * s² = SSE/(n−2), se(B) = s/√Sxx, se(ln A) = s·√(1/n + x̄²/Sxx), and at x₀ = ln ε̇₀
 * ln ŷ ± t₀.₉₇₅,ₙ₋₂ · s·√(1/n + (x₀−x̄)²/Sxx). Checked against scipy.stats.linregress.
 *
 * Table: points (ε̇, y) interpolated linearly in ln ε̇ ("log-linear"); outside the table an error
 * unless extrapolation is allowed explicitly, in which case the end segment is extended and a
 * warning is returned.
 */
import { Z975 } from '../measure/tdist.js';
import { linearRegression, rSquared } from 'simple-statistics';
import { FractozoneError } from '../errors.js';
import { studentTQuantile } from './studentT.js';


/** Statistics of a power-law fit, kept so that evaluations can carry an interval. */
export interface PowerFitStats {
  n: number;
  /** Residual standard deviation of ln y. */
  residualSd: number;
  /** Mean of ln ε̇ and Σ(ln ε̇ − mean)². */
  meanLnRate: number;
  sxx: number;
  /** Fitted strain-rate range (1/s). */
  rateRange: [number, number];
}

/**
 * Scatter of a power law's parameters as a material sheet states it: standard deviations of A
 * (same unit as A) and of B, or one relative standard deviation of the law's value. A and B are
 * taken as uncorrelated (a sheet rarely gives their covariance; for a ln–ln fit they are
 * correlated unless ln ε̇ is centred, so the interval is then approximate).
 */
export interface RateLawScatter {
  sdA?: number;
  sdB?: number;
  /** Relative sd of the value (0.1 = 10 %). */
  relSd?: number;
}

/** A strain-rate law for one quantity (L in µm or σ_0 in MPa). */
export type RateLaw =
  | { law: 'power'; A: number; B: number; fit?: PowerFitStats; scatter?: RateLawScatter }
  | { law: 'table'; points: { rate: number; value: number }[] };

/** Result of {@link fitPowerLaw}. */
export interface PowerLawFit {
  A: number;
  B: number;
  /** Coefficient of determination of the ln–ln regression. */
  r2: number;
  n: number;
  /** Standard errors (null when n < 3). */
  seB: number | null;
  seLnA: number | null;
  /** se(A) ≈ A·se(ln A) (first order). */
  seA: number | null;
  law: RateLaw & { law: 'power' };
}

function checkPairs(pairs: { rate: number; value: number }[], what: string): void {
  pairs.forEach((p, i) => {
    if (!(Number.isFinite(p.rate) && p.rate > 0)) throw new FractozoneError('BAD_PARAMETER', `${what} pair ${i + 1}: strain rate must be positive, got ${p.rate}`);
    if (!(Number.isFinite(p.value) && p.value > 0)) throw new FractozoneError('BAD_PARAMETER', `${what} pair ${i + 1}: value must be positive, got ${p.value}`);
  });
}

/**
 * Fit y = A·ε̇^B by least squares in log–log space.
 * @param pairs (strain rate in 1/s, value) pairs, values > 0; at least 2 distinct rates
 * @returns A (same unit as the values, at ε̇ = 1 /s), B, R², n and standard errors (n ≥ 3)
 */
export function fitPowerLaw(pairs: { rate: number; value: number }[]): PowerLawFit {
  checkPairs(pairs, 'rate fit');
  const n = pairs.length;
  const xy = pairs.map((p) => [Math.log(p.rate), Math.log(p.value)]);
  const xMean = xy.reduce((a, p) => a + p[0], 0) / n;
  const sxx = xy.reduce((a, p) => a + (p[0] - xMean) ** 2, 0);
  if (n < 2 || !(sxx > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `fitting a strain-rate law needs at least 2 different strain rates, got ${new Set(pairs.map((p) => p.rate)).size}`);
  }
  const { m: B, b: lnA } = linearRegression(xy);
  const r2 = rSquared(xy, (x) => lnA + B * x);
  let seB: number | null = null;
  let seLnA: number | null = null;
  let s = 0;
  if (n >= 3) {
    const sse = xy.reduce((a, p) => a + (p[1] - (lnA + B * p[0])) ** 2, 0);
    s = Math.sqrt(sse / (n - 2));
    seB = s / Math.sqrt(sxx);
    seLnA = s * Math.sqrt(1 / n + (xMean * xMean) / sxx);
  }
  const A = Math.exp(lnA);
  const rates = pairs.map((p) => p.rate);
  return {
    A,
    B,
    r2,
    n,
    seB,
    seLnA,
    seA: seLnA === null ? null : A * seLnA,
    law: { law: 'power', A, B, fit: n >= 3 ? { n, residualSd: s, meanLnRate: xMean, sxx, rateRange: [Math.min(...rates), Math.max(...rates)] } : undefined },
  };
}

/** Result of evaluating a rate law. */
export interface RateValue {
  value: number;
  /** 95 % confidence interval of the fitted mean (power law with fit statistics only). */
  interval95: [number, number] | null;
  /** Standard deviation of ln y behind `interval95` (fit or stated scatter), or null. */
  sdLn?: number | null;
  extrapolated: boolean;
  warning?: string;
}

/**
 * Standard deviation of ln y for y = A·ε̇^B with stated scatter of A and B, first-order law of
 * propagation of uncertainty for uncorrelated inputs (JCGM 100:2008, GUM, eq. 10):
 * ln y = ln A + B·ln ε̇ → sd²(ln y) = (sd_A/A)² + (ln ε̇)²·sd_B²; a stated relative sd is used as it is.
 */
export function rateLawSdLn(A: number, scatter: RateLawScatter, rate: number): number {
  if (scatter.relSd !== undefined) return scatter.relSd;
  return Math.hypot((scatter.sdA ?? 0) / A, Math.log(rate) * (scatter.sdB ?? 0));
}

/**
 * Evaluate a strain-rate law at ε̇.
 * @param law power law or table
 * @param rate strain rate in 1/s, > 0
 * @param allowExtrapolation accept rates outside a table (or outside a fitted range) with a warning
 * @throws FractozoneError BAD_PARAMETER for a rate outside a table without `allowExtrapolation`
 */
export function evaluateRateLaw(law: RateLaw, rate: number, allowExtrapolation = false): RateValue {
  if (!(Number.isFinite(rate) && rate > 0)) throw new FractozoneError('BAD_PARAMETER', `strain rate must be a positive number of 1/s, got ${rate}`);
  if (law.law === 'power') {
    const value = law.A * Math.pow(rate, law.B);
    let interval95: [number, number] | null = null;
    let sdLn: number | null = null;
    let extrapolated = false;
    let warning: string | undefined;
    if (!law.fit && law.scatter) {
      sdLn = rateLawSdLn(law.A, law.scatter, rate);
      if (sdLn > 0) interval95 = [value * Math.exp(-Z975 * sdLn), value * Math.exp(Z975 * sdLn)];
    }
    if (law.fit) {
      const f = law.fit;
      const x0 = Math.log(rate);
      const half = studentTQuantile(0.975, f.n - 2) * f.residualSd * Math.sqrt(1 / f.n + (x0 - f.meanLnRate) ** 2 / f.sxx);
      interval95 = [value * Math.exp(-half), value * Math.exp(half)];
      sdLn = half / studentTQuantile(0.975, f.n - 2);
      if (rate < f.rateRange[0] || rate > f.rateRange[1]) {
        extrapolated = true;
        warning = `strain rate ${rate} /s lies outside the fitted range ${f.rateRange[0]}–${f.rateRange[1]} /s`;
        if (!allowExtrapolation) throw new FractozoneError('BAD_PARAMETER', `${warning}; allow extrapolation explicitly to use the law there`);
      }
    }
    return { value, interval95, sdLn, extrapolated, warning };
  }
  const pts = [...law.points].sort((a, b) => a.rate - b.rate);
  if (pts.length < 2) throw new FractozoneError('BAD_PARAMETER', 'a strain-rate table needs at least 2 points');
  checkPairs(pts, 'strain-rate table');
  const x = Math.log(rate);
  const xs = pts.map((p) => Math.log(p.rate));
  let i = 0;
  let extrapolated = false;
  let warning: string | undefined;
  if (x < xs[0] || x > xs[xs.length - 1]) {
    warning = `strain rate ${rate} /s lies outside the table (${pts[0].rate}–${pts[pts.length - 1].rate} /s)`;
    if (!allowExtrapolation) throw new FractozoneError('BAD_PARAMETER', `${warning}; allow extrapolation explicitly to extend the end segment`);
    extrapolated = true;
    i = x < xs[0] ? 0 : xs.length - 2;
  } else {
    while (i < xs.length - 2 && x > xs[i + 1]) i++;
  }
  const t = (x - xs[i]) / (xs[i + 1] - xs[i]);
  const value = pts[i].value + t * (pts[i + 1].value - pts[i].value);
  if (!(value > 0)) throw new FractozoneError('BAD_PARAMETER', `extrapolated value at ${rate} /s is not positive`);
  return { value, interval95: null, extrapolated, warning };
}
