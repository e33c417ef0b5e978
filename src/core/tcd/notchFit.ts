/**
 * Failure-load prediction for notches and calibration of L and σ_0 from notched tests
 * (Theory of Critical Distances, D. Taylor, Elsevier 2007, ch. 2 and 5).
 *
 * Linear-elastic scaling: a "unit curve" s(r) is the stress per unit load (per N, per kN, per MPa of
 * nominal stress — whatever load unit the caller uses consistently). At load P the stress is P·s(r).
 *
 * Calibration (point method): the curves at failure σ_i(r) = P_i·s_i(r) of different notches cross at
 * (L/2, σ_0). Generalised to any method and any number n ≥ 2 of notches: with e_i(L) the method's
 * effective stress of s_i (point s_i(L/2), line mean over 0…2L, area mean over radius L), choose L
 * minimising the spread Σ_i (ln P_i e_i(L) − ln σ_0)², σ_0 = geometric mean of P_i e_i(L). For n = 2
 * the minimum is the exact crossing, found by bisection on ln P_1 e_1 − ln P_2 e_2; for n ≥ 3 a
 * log-spaced grid search followed by golden-section refinement. Residual per specimen: predicted /
 * actual failure load = σ_0 / (P_i e_i(L)).
 */
import { FractozoneError } from '../errors.js';
import { warn, type Warning } from '../warnings.js';
import { criticalDistance, type TcdMethod } from './criticalDistance.js';
import { effectiveStress, maxCriticalDistance, type StressCurve } from './stressCurve.js';

/** One notched specimen: its stress per unit load and its failure load (same load unit for all). */
export interface NotchSpecimen {
  name: string;
  /** Stress per unit load along the bisector (MPa per load unit). */
  unitCurve: StressCurve;
  /** Failure load in the load unit of `unitCurve`, > 0. */
  failureLoad: number;
}

/** Result of a calibration from notched specimens. */
export interface NotchFit {
  method: TcdMethod;
  L_m: number;
  L_um: number;
  sigma0_MPa: number;
  /** 'intersection' for two specimens, 'least-squares' for more. */
  solver: 'intersection' | 'least-squares';
  /** Per specimen: actual and predicted failure load and their ratio predicted/actual. */
  residuals: { name: string; failureLoad: number; predictedLoad: number; ratio: number }[];
  /** Root-mean-square of ln(ratio), as a percentage (0 for an exact two-curve crossing). */
  rmsLogResidualPct: number;
  /** Search range for L in metres. */
  searchRange_m: [number, number];
  warnings: Warning[];
}

/**
 * Failure load of a notch predicted by a TCD method: P_f = σ_0 / e(L), e the method's effective
 * stress of the unit curve (point: s(L/2); line: mean of s over 0…2L; area: mean over the half-disc).
 * @param unitCurve stress per unit load (MPa per load unit)
 * @param L_m critical distance in metres
 * @param sigma0_MPa inherent strength in MPa
 * @param method TCD method
 * @returns failure load in the load unit of the unit curve
 */
export function predictFailureLoad(unitCurve: StressCurve, L_m: number, sigma0_MPa: number, method: TcdMethod): number {
  if (!(Number.isFinite(sigma0_MPa) && sigma0_MPa > 0)) throw new FractozoneError('BAD_PARAMETER', `inherent strength must be positive, got ${sigma0_MPa} MPa`);
  const e = effectiveStress(unitCurve, L_m, method);
  if (!(e > 0)) throw new FractozoneError('BAD_CURVE', `${unitCurve.label}: the ${method}-method stress is not positive at L = ${L_m * 1e6} µm`);
  return sigma0_MPa / e;
}

/** Options for {@link fitNotches}. */
export interface FitNotchesOptions {
  /** L search range in metres; default from the curves' extent (largest usable L down to 1e-5 of it). */
  range_m?: [number, number];
  /** Grid points for the search (default 800). */
  gridPoints?: number;
}

function logStress(sp: NotchSpecimen, L: number, method: TcdMethod): number {
  const e = effectiveStress(sp.unitCurve, L, method) * sp.failureLoad;
  return e > 0 ? Math.log(e) : NaN;
}

/** A log-spaced grid of `n` L values over [lo, hi] (m). */
function logGrid(lo: number, hi: number, n: number): number[] {
  const grid: number[] = [];
  for (let i = 0; i < n; i++) grid.push(lo * Math.pow(hi / lo, i / (n - 1)));
  return grid;
}

/** The L search range: given, or from the curves' extent (largest usable L down to 1e-5 of it). */
function searchRange(specimens: NotchSpecimen[], method: TcdMethod, range?: [number, number]): [number, number] {
  let [lo, hi] = range ?? [NaN, NaN];
  if (!range) {
    const maxes = specimens.map((s) => maxCriticalDistance(s.unitCurve, method)).filter((v): v is number => v !== undefined);
    hi = maxes.length ? Math.min(...maxes) : 0.1;
    lo = hi * 1e-5;
  }
  if (!(lo > 0 && hi > lo)) throw new FractozoneError('BAD_PARAMETER', `L search range must satisfy 0 < low < high, got [${lo}, ${hi}] m`);
  return [lo, hi];
}

/** Bisection in log L of h on [a, b] where h changes sign (h(a) = ha). */
function bisectLog(h: (x: number) => number, a: number, b: number, ha: number): number {
  for (let k = 0; k < 200 && b - a > 1e-14 * b; k++) {
    const m = Math.sqrt(a * b);
    const hm = h(m);
    if (hm === 0) return m;
    if (ha * hm < 0) b = m;
    else {
      a = m;
      ha = hm;
    }
  }
  return Math.sqrt(a * b);
}

/** Two specimens: the crossings of the two curves at failure on the grid, refined by bisection (smallest first). */
function crossings(specimens: NotchSpecimen[], method: TcdMethod, grid: number[]): number[] {
  const h = (x: number): number => logStress(specimens[0], x, method) - logStress(specimens[1], x, method);
  const roots: number[] = [];
  let prevX = grid[0];
  let prevH = h(prevX);
  for (let i = 1; i < grid.length; i++) {
    const x = grid[i];
    const hx = h(x);
    if (Number.isFinite(prevH) && Number.isFinite(hx) && (hx === 0 || prevH * hx < 0)) roots.push(hx === 0 ? x : bisectLog(h, prevX, x, prevH));
    prevX = x;
    prevH = hx;
  }
  return roots;
}

/** More specimens: the grid minimum of Σ(ln P_i e_i(L) − mean)², refined by golden section in log L. */
function leastSquaresL(specimens: NotchSpecimen[], method: TcdMethod, grid: number[], warnings: Warning[]): number {
  const n = grid.length;
  const f = (x: number): number => {
    const v = specimens.map((sp) => logStress(sp, x, method));
    if (v.some((t) => !Number.isFinite(t))) return Infinity;
    const m = v.reduce((a, b) => a + b, 0) / v.length;
    return v.reduce((a, b) => a + (b - m) ** 2, 0);
  };
  let best = 0;
  let bestF = Infinity;
  for (let i = 0; i < n; i++) {
    const fx = f(grid[i]);
    if (fx < bestF) {
      bestF = fx;
      best = i;
    }
  }
  if (!Number.isFinite(bestF)) throw new FractozoneError('PROCESSING_FAILED', 'no L in the search range gives positive stresses for all specimens', 'processing');
  if (best === 0 || best === n - 1) warnings.push(warn('FIT_AT_RANGE_EDGE', `the best L lies at the edge of the search range (${fmtUm(grid[best])}); widen the range or check the curves`));
  // golden-section in log L on the bracket around the grid minimum
  let a = Math.log(grid[Math.max(0, best - 1)]);
  let b = Math.log(grid[Math.min(n - 1, best + 1)]);
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(Math.exp(c));
  let fd = f(Math.exp(d));
  for (let k = 0; k < 100 && b - a > 1e-13; k++) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(Math.exp(c));
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(Math.exp(d));
    }
  }
  return Math.exp((a + b) / 2);
}

/**
 * Fit L and σ_0 from the failure loads of n ≥ 2 notch geometries (see the module note).
 * @param specimens at least two specimens with unit curves in a common load unit
 * @param method 'point' | 'line' | 'area'
 * @param options search range and grid
 * @returns the fitted L (m, µm), σ_0 (MPa) and per-specimen residuals
 * @throws FractozoneError BAD_PARAMETER for < 2 specimens or bad loads; PROCESSING_FAILED when two
 *   curves do not cross inside the range
 */
export function fitNotches(specimens: NotchSpecimen[], method: TcdMethod, options: FitNotchesOptions = {}): NotchFit {
  if (specimens.length < 2) {
    throw new FractozoneError('BAD_PARAMETER', `fitting L and σ_0 needs at least 2 notch geometries, got ${specimens.length}`);
  }
  for (const sp of specimens) {
    if (!(Number.isFinite(sp.failureLoad) && sp.failureLoad > 0)) {
      throw new FractozoneError('BAD_PARAMETER', `${sp.name}: failure load must be positive, got ${sp.failureLoad}`);
    }
  }
  const warnings: Warning[] = [];
  const [lo, hi] = searchRange(specimens, method, options.range_m);
  const grid = logGrid(lo, hi, Math.max(50, options.gridPoints ?? 800));
  let L: number;
  let solver: NotchFit['solver'];
  if (specimens.length === 2) {
    solver = 'intersection';
    const roots = crossings(specimens, method, grid);
    if (roots.length === 0) {
      throw new FractozoneError(
        'PROCESSING_FAILED',
        `the ${method}-method stress curves of ${specimens[0].name} and ${specimens[1].name} at failure do not cross for L between ${fmtUm(lo)} and ${fmtUm(hi)}; L and σ_0 cannot be fitted`,
        'processing',
      );
    }
    if (roots.length > 1) warnings.push(warn('CURVES_CROSS_MORE_THAN_ONCE', `the curves cross ${roots.length} times; the smallest L was taken (others: ${roots.slice(1).map(fmtUm).join(', ')})`));
    L = roots[0];
  } else {
    solver = 'least-squares';
    L = leastSquaresL(specimens, method, grid, warnings);
  }
  const logs = specimens.map((sp) => logStress(sp, L, method));
  const lnS0 = logs.reduce((x, y) => x + y, 0) / logs.length;
  const residuals = specimens.map((sp, i) => {
    const ratio = Math.exp(lnS0 - logs[i]);
    return { name: sp.name, failureLoad: sp.failureLoad, predictedLoad: sp.failureLoad * ratio, ratio };
  });
  const rms = Math.sqrt(logs.reduce((acc, v) => acc + (v - lnS0) ** 2, 0) / logs.length) * 100;
  for (const sp of specimens) {
    if (sp.unitCurve.analysis === 'elastoplastic') warnings.push(warn('ELASTOPLASTIC_SCALED_LINEARLY', `${sp.name}: elastoplastic curve scaled linearly with load; the fit assumes linear-elastic scaling`));
  }
  return { method, L_m: L, L_um: L * 1e6, sigma0_MPa: Math.exp(lnS0), solver, residuals, rmsLogResidualPct: rms, searchRange_m: [lo, hi], warnings };
}

function fmtUm(m: number): string {
  return `${Number((m * 1e6).toPrecision(5))} µm`;
}

/**
 * Fit L (and σ_0 = K_c/√(πL)) from a known fracture toughness and ONE notched specimen: solve
 * P·e(L) = K_c/√(πL) for L by bisection in log L (Taylor 2007: L and σ_0 linked through K_c).
 * @param Kc_MPa_sqrtm fracture toughness in MPa·√m (e.g. from a cracked plain specimen)
 * @param specimen the notched specimen
 * @param method TCD method
 * @param range_m L search range in metres (default from the curve extent)
 * @returns `{ L_m, L_um, sigma0_MPa }`
 */
export function fitWithToughness(
  Kc_MPa_sqrtm: number,
  specimen: NotchSpecimen,
  method: TcdMethod,
  range_m?: [number, number],
): { L_m: number; L_um: number; sigma0_MPa: number } {
  if (!(Number.isFinite(Kc_MPa_sqrtm) && Kc_MPa_sqrtm > 0)) throw new FractozoneError('BAD_PARAMETER', `fracture toughness must be positive, got ${Kc_MPa_sqrtm}`);
  const hiDefault = maxCriticalDistance(specimen.unitCurve, method) ?? 0.1;
  const [lo, hi] = range_m ?? [hiDefault * 1e-6, hiDefault];
  const h = (L: number): number => logStress(specimen, L, method) - Math.log(Kc_MPa_sqrtm / Math.sqrt(Math.PI * L));
  let a = lo;
  let b = hi;
  let ha = h(a);
  const hb = h(b);
  if (!(ha * hb <= 0)) {
    throw new FractozoneError('PROCESSING_FAILED', `${specimen.name}: no L between ${fmtUm(lo)} and ${fmtUm(hi)} is consistent with K_c = ${Kc_MPa_sqrtm} MPa·√m`, 'processing');
  }
  for (let k = 0; k < 200 && b - a > 1e-14 * b; k++) {
    const m = Math.sqrt(a * b);
    const hm = h(m);
    if (ha * hm <= 0) b = m;
    else {
      a = m;
      ha = hm;
    }
  }
  const L = Math.sqrt(a * b);
  return { L_m: L, L_um: L * 1e6, sigma0_MPa: Kc_MPa_sqrtm / Math.sqrt(Math.PI * L) };
}

/**
 * L from a cracked plain specimen's K_c and a plain (unnotched) specimen's strength, taking σ_0 equal
 * to the plain strength — valid for brittle behaviour only (Taylor 2007: σ_0 = σ_u when the material
 * is linear-elastic to failure; larger otherwise, which this shortcut underestimates).
 * @param Kc_MPa_sqrtm fracture toughness in MPa·√m
 * @param plainStrength_MPa plain-specimen strength in MPa
 */
export function fromPlainSpecimens(Kc_MPa_sqrtm: number, plainStrength_MPa: number): { L_m: number; L_um: number; sigma0_MPa: number; note: string } {
  const { L_m, L_um } = criticalDistance(Kc_MPa_sqrtm, plainStrength_MPa);
  return { L_m, L_um, sigma0_MPa: plainStrength_MPa, note: 'σ_0 taken equal to the plain-specimen strength (brittle behaviour assumed)' };
}
