/**
 * The critical distance of the Theory of Critical Distances and the characteristic distances of its
 * point, line and area methods.
 *
 * References:
 * 1. D. Taylor, The Theory of Critical Distances: A New Perspective in Fracture Mechanics,
 *    Elsevier, Oxford, 2007 (L = (1/π)(K_c/σ_0)², point method at L/2, line method over 2L,
 *    area method over a semicircle).
 * 2. M.H. El Haddad, T.H. Topper, K.N. Smith, Prediction of non propagating cracks,
 *    Eng. Fract. Mech. 11 (1979) 573–584 (a0 = (1/π)(ΔK_th/Δσ_0)², the same expression).
 */
import { FractozoneError } from '../errors.js';

/**
 * Critical distance L = (1/π)·(K/σ)².
 *
 * The same function gives the El Haddad–Topper–Smith intrinsic crack length
 * a0 = (1/π)(ΔK_th/Δσ_0)² when called with the threshold stress-intensity range and the plain
 * fatigue limit range (ref. 2).
 *
 * @param Kc_MPa_sqrtm fracture toughness K_c (or ΔK_th) in MPa·√m, > 0
 * @param sigma0_MPa inherent strength σ_0 (or fatigue limit range Δσ_0) in MPa, > 0
 * @returns `{ L_m, L_um }`, the critical distance in metres and micrometres
 * @throws FractozoneError BAD_PARAMETER for non-positive or non-finite inputs
 */
export function criticalDistance(Kc_MPa_sqrtm: number, sigma0_MPa: number): { L_m: number; L_um: number } {
  if (!(Number.isFinite(Kc_MPa_sqrtm) && Kc_MPa_sqrtm > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `fracture toughness must be a positive finite number of MPa·√m, got ${Kc_MPa_sqrtm}`);
  }
  if (!(Number.isFinite(sigma0_MPa) && sigma0_MPa > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `inherent strength must be a positive finite number of MPa, got ${sigma0_MPa}`);
  }
  const r = Kc_MPa_sqrtm / sigma0_MPa; // √m
  const L_m = (r * r) / Math.PI;
  return { L_m, L_um: L_m * 1e6 };
}

/**
 * Toughness that goes with a critical distance and an inherent strength: K = σ_0·√(π·L)
 * (the inverse of {@link criticalDistance}).
 * @param L_m critical distance in metres, > 0
 * @param sigma0_MPa inherent strength in MPa, > 0
 * @returns toughness in MPa·√m
 */
export function toughnessFromDistance(L_m: number, sigma0_MPa: number): number {
  if (!(Number.isFinite(L_m) && L_m > 0)) throw new FractozoneError('BAD_PARAMETER', `critical distance must be a positive length, got ${L_m} m`);
  if (!(Number.isFinite(sigma0_MPa) && sigma0_MPa > 0)) throw new FractozoneError('BAD_PARAMETER', `inherent strength must be positive, got ${sigma0_MPa} MPa`);
  return sigma0_MPa * Math.sqrt(Math.PI * L_m);
}

/** Characteristic distances of the three TCD methods, in µm. */
export interface MethodDistances {
  /** Point method: the stress at r = L/2 from the notch root. */
  pointDistance_um: number;
  /** Line method: the mean stress over 0 … 2L. */
  lineDistance_um: number;
  /** Area method: the mean stress over a half-disc of radius L centred at the notch root. */
  areaRadius_um: number;
}

/**
 * Characteristic distances of the point (L/2), line (2L) and area (radius L) methods (Taylor 2007).
 * @param L_um critical distance in µm
 */
export function methodDistances(L_um: number): MethodDistances {
  return { pointDistance_um: L_um / 2, lineDistance_um: 2 * L_um, areaRadius_um: L_um };
}

/** The three TCD methods. */
export type TcdMethod = 'point' | 'line' | 'area';
