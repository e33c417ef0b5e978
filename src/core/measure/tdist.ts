/**
 * Student t distribution: CDF through the regularized incomplete beta function and its inverse
 * by bracketing + bisection. Degrees of freedom may be fractional (needed for effective sample
 * sizes).
 *
 * References:
 * [1] W. H. Press et al., Numerical Recipes, 3rd ed., §6.1 (ln Γ, Lanczos), §6.4 (incomplete
 *     beta by continued fraction, modified Lentz), §6.14 (Student t CDF via I_x(ν/2, 1/2)).
 * [2] M. Abramowitz, I. Stegun, Handbook of Mathematical Functions, 26.7.1 (t distribution),
 *     26.5.27 (relation to the incomplete beta).
 */

const LANCZOS = [
  57.1562356658629235, -59.5979603554754912, 14.1360979747417471, -0.491913816097620199,
  0.339946499848118887e-4, 0.465236289270485756e-4, -0.983744753048795646e-4, 0.158088703224912494e-3,
  -0.210264441724104883e-3, 0.217439618115212643e-3, -0.164318106536763890e-3, 0.844182239838527433e-4,
  -0.261908384015814087e-4, 0.368991826595316234e-5,
];

/** ln Γ(x) for x > 0 (Lanczos approximation, Numerical Recipes 3rd ed. §6.1, ~1e-15 relative). */
export function lnGamma(x: number): number {
  let y = x;
  const tmp0 = x + 5.24218750000000000;
  const tmp = (x + 0.5) * Math.log(tmp0) - tmp0;
  let ser = 0.999999999999997092;
  for (let j = 0; j < 14; j++) ser += LANCZOS[j] / ++y;
  return tmp + Math.log((2.5066282746310005 * ser) / x);
}

function betacf(a: number, b: number, x: number): number {
  const FPMIN = 1e-300;
  const EPS = 1e-15;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < FPMIN) d = FPMIN;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < 10000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = 1 + aa / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = 1 + aa / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}

/**
 * Regularized incomplete beta I_x(a, b) (Numerical Recipes 3rd ed. §6.4).
 *
 * @param x - in [0, 1]
 * @param a - > 0
 * @param b - > 0
 */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const bt = Math.exp(lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  if (x < (a + 1) / (a + b + 2)) return (bt * betacf(a, b, x)) / a;
  return 1 - (bt * betacf(b, a, 1 - x)) / b;
}

/**
 * Student t cumulative distribution function P(T ≤ t) for ν degrees of freedom
 * (Abramowitz & Stegun 26.5.27 / 26.7.1: 1 − ½·I_{ν/(ν+t²)}(ν/2, ½) for t > 0).
 *
 * @param t - quantile value
 * @param df - degrees of freedom ν > 0 (fractional allowed)
 */
export function studentTCdf(t: number, df: number): number {
  const x = df / (df + t * t);
  const tail = 0.5 * incompleteBeta(x, df / 2, 0.5);
  return t > 0 ? 1 - tail : tail;
}

/**
 * Inverse Student t CDF (quantile function): the t with P(T ≤ t) = p.
 * Bracketing then 200 bisection steps on {@link studentTCdf}; absolute accuracy ≈ 1e-12.
 *
 * @param p - probability in (0, 1)
 * @param df - degrees of freedom ν > 0 (fractional allowed)
 * @returns the quantile t_p(ν)
 */
export function studentTInv(p: number, df: number): number {
  if (!(p > 0 && p < 1) || !(df > 0)) return NaN;
  if (p === 0.5) return 0;
  const upper = p > 0.5;
  const q = upper ? p : 1 - p; // solve for the upper quantile, mirror at the end
  let lo = 0;
  let hi = 1;
  while (studentTCdf(hi, df) < q && hi < 1e300) {
    lo = hi;
    hi *= 2;
  }
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (studentTCdf(mid, df) < q) lo = mid;
    else hi = mid;
    if (hi - lo <= 1e-13 * Math.max(1, hi)) break;
  }
  const t = 0.5 * (lo + hi);
  return upper ? t : -t;
}

/** The 97.5 % quantile of the standard normal distribution (95 % two-sided coverage factor). */
export const Z975 = 1.959963984540054;
