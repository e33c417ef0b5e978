/**
 * Stress–distance curves along the notch bisector, and the effective stresses of the point, line and
 * area methods computed from them with exact integration.
 *
 * Distances are metres from the notch root (crack tip, hole edge), stresses MPa (the opening stress
 * σ_yy normal to the bisector).
 *
 * References:
 * 1. G.R. Irwin, Analysis of stresses and strains near the end of a crack, J. Appl. Mech. 24 (1957):
 *    sharp crack σ_yy = K/√(2πr) on the crack line.
 * 2. M. Creager, P.C. Paris, Elastic field equations for blunt cracks with reference to stress
 *    corrosion cracking, Int. J. Fract. Mech. 3 (1967) 247–252: σ_yy(r) = (2K/√π)(r+ρ)/(2r+ρ)^{3/2},
 *    r from the notch root, peak 2K/√(πρ).
 * 3. S.P. Timoshenko, J.N. Goodier, Theory of Elasticity, 3rd ed., McGraw-Hill 1970, §35 (Kirsch):
 *    σ_yy(r) = σ∞[1 + ½(a/r)² + (3/2)(a/r)⁴] along the axis normal to the load, r from the centre, Kt = 3.
 * 4. D. Taylor, The Theory of Critical Distances, Elsevier 2007 (point, line, area methods).
 *
 * Area method assumption (documented choice): the mean over the half-disc of radius R centred at the
 * notch root is computed as if the stress depended on the distance from the root only, taking the
 * bisector curve for every direction: σ̄_A = (2/R²)∫₀ᴿ σ(r)·r dr. This is exact for a radially
 * symmetric field and conservative-to-neutral near a notch (off-bisector stresses are lower); for a
 * sharp crack it gives σ̄_A = (4/3)K/√(2πR), so the area method with R = L predicts failure at
 * K = (3/(2√2))·K_c ≈ 1.061·K_c instead of exactly K_c. The 2D angular fields are not used.
 */
import { FractozoneError } from '../errors.js';
import type { TcdMethod } from './criticalDistance.js';

/** Whether a stress curve came from a linear-elastic or an elastoplastic analysis (metadata only). */
export type AnalysisKind = 'linear-elastic' | 'elastoplastic';

/** A stress–distance curve along the notch bisector. */
export interface StressCurve {
  /** Where the curve comes from. */
  readonly kind: 'sharp-crack' | 'blunt-notch' | 'hole' | 'tabulated' | 'scaled';
  /** Human-readable description (names the source file for tabulated curves). */
  readonly label: string;
  /** Largest distance (m) at which the curve is defined; undefined = no limit. */
  readonly rMax?: number;
  /** Stress analysis the curve comes from (metadata). */
  readonly analysis: AnalysisKind;
  /** Opening stress in MPa at distance `r_m` (m) from the notch root. */
  stressAt(r_m: number): number;
  /** Exact ∫₀ᵈ σ(r) dr in MPa·m. */
  integral(d_m: number): number;
  /** Exact ∫₀ᴿ σ(r)·r dr in MPa·m². */
  momentIntegral(R_m: number): number;
}

function checkDistance(curve: { label: string; rMax?: number }, r: number, what = 'distance'): void {
  if (!(Number.isFinite(r) && r >= 0)) {
    throw new FractozoneError('BAD_PARAMETER', `${curve.label}: ${what} must be a non-negative finite length, got ${r} m`);
  }
  if (curve.rMax !== undefined && r > curve.rMax * (1 + 1e-12)) {
    throw new FractozoneError(
      'BAD_CURVE',
      `${curve.label}: ${what} ${fmtMm(r)} lies beyond the last point of the curve (${fmtMm(curve.rMax)}); the curve is not extrapolated`,
    );
  }
}

function fmtMm(m: number): string {
  return `${Number((m * 1e3).toPrecision(6))} mm`;
}

function positive(v: number, what: string): void {
  if (!(Number.isFinite(v) && v > 0)) throw new FractozoneError('BAD_PARAMETER', `${what} must be a positive finite number, got ${v}`);
}

/**
 * Sharp crack: σ_yy(r) = K/√(2πr) (ref. 1).
 * @param K_MPa_sqrtm stress intensity factor in MPa·√m (per unit load if used as a unit curve)
 * @returns a curve with closed-form integrals: ∫₀ᵈσ = 2K√d/√(2π), ∫₀ᴿσr = (2/3)K R^{3/2}/√(2π)
 */
export function sharpCrackCurve(K_MPa_sqrtm: number): StressCurve {
  positive(K_MPa_sqrtm, 'stress intensity factor');
  const c = K_MPa_sqrtm / Math.sqrt(2 * Math.PI);
  const self: StressCurve = {
    kind: 'sharp-crack',
    label: `sharp crack, K = ${K_MPa_sqrtm} MPa·√m`,
    analysis: 'linear-elastic',
    stressAt: (r) => (checkDistance(self, r), c / Math.sqrt(r)),
    integral: (d) => (checkDistance(self, d), 2 * c * Math.sqrt(d)),
    momentIntegral: (R) => (checkDistance(self, R), (2 / 3) * c * Math.pow(R, 1.5)),
  };
  return self;
}

/**
 * Blunt notch after Creager & Paris (ref. 2): σ_yy(r) = (2K/√π)(r+ρ)/(2r+ρ)^{3/2}, r from the notch
 * root, peak value 2K/√(πρ) at r = 0, tending to K/√(2πr) for r ≫ ρ.
 * @param K_MPa_sqrtm stress intensity factor of the equivalent crack in MPa·√m
 * @param rho_m notch root radius ρ in metres, > 0
 * @returns a curve with closed-form integrals: ∫₀ᵈσ = 2Kd/√(π(2d+ρ)) and
 *   ∫₀ᴿσr = (2K/√π)(1/8)[(2/3)(U^{3/2} − ρ^{3/2}) + 2ρ²(U^{-1/2} − ρ^{-1/2})], U = 2R+ρ
 */
export function bluntNotchCurve(K_MPa_sqrtm: number, rho_m: number): StressCurve {
  positive(K_MPa_sqrtm, 'stress intensity factor');
  positive(rho_m, 'notch root radius');
  const k = (2 * K_MPa_sqrtm) / Math.sqrt(Math.PI);
  const rho = rho_m;
  const self: StressCurve = {
    kind: 'blunt-notch',
    label: `blunt notch (Creager–Paris), K = ${K_MPa_sqrtm} MPa·√m, ρ = ${fmtMm(rho)}`,
    analysis: 'linear-elastic',
    stressAt: (r) => (checkDistance(self, r), (k * (r + rho)) / Math.pow(2 * r + rho, 1.5)),
    integral: (d) => (checkDistance(self, d), (k * d) / Math.sqrt(2 * d + rho)),
    momentIntegral: (R) => {
      checkDistance(self, R);
      const U = 2 * R + rho;
      return k * (1 / 8) * ((2 / 3) * (Math.pow(U, 1.5) - Math.pow(rho, 1.5)) + 2 * rho * rho * (1 / Math.sqrt(U) - 1 / Math.sqrt(rho)));
    },
  };
  return self;
}

/**
 * Kirsch solution for a circular hole of radius a in an infinite plate under remote uniaxial stress
 * σ∞, opening stress on the axis through the centre normal to the load (ref. 3):
 * σ_yy(r) = σ∞[1 + ½(a/r)² + (3/2)(a/r)⁴], with r measured from the hole centre (r ≥ a).
 * @param r_m distance from the hole centre in metres, ≥ a
 * @param a_m hole radius in metres
 * @param sigmaInf_MPa remote stress in MPa
 * @returns σ_yy in MPa (3σ∞ at the edge, Kt = 3)
 */
export function kirschStressFromCentre(r_m: number, a_m: number, sigmaInf_MPa: number): number {
  positive(a_m, 'hole radius');
  if (!(Number.isFinite(r_m) && r_m >= a_m)) {
    throw new FractozoneError('BAD_PARAMETER', `distance from the hole centre must be at least the hole radius (${fmtMm(a_m)}), got ${fmtMm(r_m)}`);
  }
  const q = (a_m / r_m) ** 2;
  return sigmaInf_MPa * (1 + 0.5 * q + 1.5 * q * q);
}

/**
 * Kirsch hole field (ref. 3) as a curve whose distance x is measured from the hole EDGE (the notch
 * root for the TCD), x = r − a.
 * @param a_m hole radius in metres, > 0
 * @param sigmaInf_MPa remote stress in MPa (per unit load if used as a unit curve), > 0
 * @returns a curve with closed-form integrals (see source)
 */
export function holeCurve(a_m: number, sigmaInf_MPa: number): StressCurve {
  positive(a_m, 'hole radius');
  positive(sigmaInf_MPa, 'remote stress');
  const a = a_m;
  const s = sigmaInf_MPa;
  const self: StressCurve = {
    kind: 'hole',
    label: `circular hole (Kirsch), a = ${fmtMm(a)}, σ∞ = ${s} MPa`,
    analysis: 'linear-elastic',
    stressAt: (x) => (checkDistance(self, x), kirschStressFromCentre(a + x, a, s)),
    integral: (d) => {
      checkDistance(self, d);
      const b = a + d;
      // ∫_a^b [1 + ½a²r⁻² + (3/2)a⁴r⁻⁴] dr
      return s * (d + 0.5 * a * a * (1 / a - 1 / b) + 0.5 * a ** 4 * (1 / a ** 3 - 1 / b ** 3));
    },
    momentIntegral: (R) => {
      checkDistance(self, R);
      const b = a + R;
      // ∫_a^b σ(r)(r − a) dr, term by term
      const t0 = (R * R) / 2;
      const t1 = 0.5 * a * a * (Math.log(b / a) + a / b - 1);
      const t2 = 1.5 * a ** 4 * (-1 / (2 * b * b) + a / (3 * b ** 3) + 1 / (6 * a * a));
      return s * (t0 + t1 + t2);
    },
  };
  return self;
}

/**
 * A curve given as points (distance m, stress MPa), linearly interpolated inside, never extrapolated.
 * @param r_m distances in metres, strictly increasing, first ≥ 0; at least 3 points
 * @param sigma_MPa stresses in MPa, finite
 * @param label name used in messages (e.g. the file name)
 * @param analysis linear-elastic (default) or elastoplastic (metadata only)
 * @returns a curve whose integrals are exact for the piecewise-linear interpolant (trapezoid rule
 *   on each segment; ∫σr uses the exact cubic of each linear segment). A curve that does not start
 *   at r = 0 is defined from its first point; the line and area means need it to start at 0.
 */
export function tabulatedCurve(r_m: ArrayLike<number>, sigma_MPa: ArrayLike<number>, label = 'curve', analysis: AnalysisKind = 'linear-elastic'): StressCurve {
  const n = r_m.length;
  if (n !== sigma_MPa.length) throw new FractozoneError('BAD_CURVE', `${label}: distance and stress columns differ in length`);
  if (n < 3) {
    throw new FractozoneError('BAD_CURVE', `${label}: needs at least 3 points (got ${n}); with fewer the stress gradient near the notch root is not described`);
  }
  const r = Float64Array.from(r_m as ArrayLike<number>);
  const s = Float64Array.from(sigma_MPa as ArrayLike<number>);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(r[i]) || !Number.isFinite(s[i])) throw new FractozoneError('BAD_CURVE', `${label}: point ${i + 1} is not a finite number`);
    if (i === 0 && r[i] < 0) throw new FractozoneError('BAD_CURVE', `${label}: distances must be ≥ 0 (from the notch root)`);
    if (i > 0 && !(r[i] > r[i - 1])) throw new FractozoneError('BAD_CURVE', `${label}: distance must increase strictly (point ${i + 1})`);
  }
  const r0 = r[0];
  const rMax = r[n - 1];
  const seg = (x: number): number => {
    // index i with r[i] ≤ x ≤ r[i+1]
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (r[mid] <= x) lo = mid;
      else hi = mid;
    }
    return lo;
  };
  const needStart = (x: number, what: string): void => {
    if (r0 > 0 && x > 0) {
      throw new FractozoneError('BAD_CURVE', `${label}: the ${what} needs the curve from the notch root, but its first distance is ${fmtMm(r0)}`);
    }
  };
  const interp = (x: number): number => {
    const i = seg(Math.min(x, rMax));
    if (i >= n - 1) return s[n - 1];
    const t = (x - r[i]) / (r[i + 1] - r[i]);
    return s[i] + t * (s[i + 1] - s[i]);
  };
  // exact ∫ over [r[i], x] of the linear segment, of σ (p = 0) or σ·r (p = 1)
  const segIntegral = (i: number, x: number, p: 0 | 1): number => {
    const x0 = r[i];
    const y0 = s[i];
    const y1 = interp(x);
    if (p === 0) return 0.5 * (y0 + y1) * (x - x0);
    // σ = α + βr on the segment
    if (x === x0) return 0;
    const beta = (y1 - y0) / (x - x0);
    const alpha = y0 - beta * x0;
    return (alpha * (x * x - x0 * x0)) / 2 + (beta * (x ** 3 - x0 ** 3)) / 3;
  };
  const cumulative = (x: number, p: 0 | 1): number => {
    const k = seg(x);
    let acc = 0;
    for (let i = 0; i < k; i++) acc += segIntegral(i, r[i + 1], p);
    return acc + segIntegral(k, x, p);
  };
  const self: StressCurve = {
    kind: 'tabulated',
    label,
    rMax,
    analysis,
    stressAt: (x) => {
      checkDistance(self, x);
      if (x < r0) throw new FractozoneError('BAD_CURVE', `${label}: distance ${fmtMm(x)} lies before the first point (${fmtMm(r0)})`);
      return interp(x);
    },
    integral: (d) => (checkDistance(self, d, 'line-method length'), needStart(d, 'line method'), d === 0 ? 0 : cumulative(d, 0)),
    momentIntegral: (R) => (checkDistance(self, R, 'area-method radius'), needStart(R, 'area method'), R === 0 ? 0 : cumulative(R, 1)),
  };
  return self;
}

/**
 * A curve multiplied by a constant factor (linear-elastic scaling with the load).
 * @param curve the curve, e.g. stress per unit load
 * @param factor the multiplier, e.g. the failure load, > 0
 */
export function scaleCurve(curve: StressCurve, factor: number): StressCurve {
  positive(factor, 'scale factor');
  return {
    kind: 'scaled',
    label: curve.label,
    rMax: curve.rMax,
    analysis: curve.analysis,
    stressAt: (r) => factor * curve.stressAt(r),
    integral: (d) => factor * curve.integral(d),
    momentIntegral: (R) => factor * curve.momentIntegral(R),
  };
}

/**
 * Mean stress over 0 … d (exact for every curve of this module).
 * @param curve the curve
 * @param d_m length in metres, > 0
 * @returns mean stress in MPa
 */
export function lineMeanStress(curve: StressCurve, d_m: number): number {
  positive(d_m, 'line-method length');
  return curve.integral(d_m) / d_m;
}

/**
 * Mean stress over the half-disc of radius R centred at the notch root, assuming the stress depends on
 * the distance from the root only (see the module note): σ̄ = (2/R²)∫₀ᴿ σ(r) r dr.
 * @param curve the curve
 * @param R_m radius in metres, > 0
 * @returns mean stress in MPa
 */
export function areaMeanStress(curve: StressCurve, R_m: number): number {
  positive(R_m, 'area-method radius');
  return (2 * curve.momentIntegral(R_m)) / (R_m * R_m);
}

/**
 * Effective stress of a TCD method for critical distance L: point σ(L/2), line mean over 0…2L,
 * area mean over the half-disc of radius L (Taylor 2007).
 * @param curve the stress–distance curve
 * @param L_m critical distance in metres
 * @param method 'point' | 'line' | 'area'
 * @returns effective stress in MPa (same per-load scaling as the curve)
 */
export function effectiveStress(curve: StressCurve, L_m: number, method: TcdMethod): number {
  positive(L_m, 'critical distance');
  switch (method) {
    case 'point':
      return curve.stressAt(L_m / 2);
    case 'line':
      return lineMeanStress(curve, 2 * L_m);
    case 'area':
      return areaMeanStress(curve, L_m);
  }
}

/** Largest critical distance (m) a curve supports for a method (undefined: no limit). */
export function maxCriticalDistance(curve: StressCurve, method: TcdMethod): number | undefined {
  if (curve.rMax === undefined) return undefined;
  return method === 'point' ? 2 * curve.rMax : method === 'line' ? curve.rMax / 2 : curve.rMax;
}
