/**
 * Student's t for the critical-distance fits: the one implementation lives in
 * src/core/measure/tdist.ts (regularized incomplete beta, Numerical Recipes 3rd ed. §6.4, checked
 * against SciPy); this module gives it the names the tcd code uses and throws on bad arguments.
 */
import { studentTCdf, studentTInv } from '../measure/tdist.js';

export { studentTCdf };

/**
 * Quantile of Student's t (inverse CDF), e.g. studentTQuantile(0.975, 10) ≈ 2.228.
 * @param p probability in (0, 1)
 * @param df degrees of freedom, > 0
 */
export function studentTQuantile(p: number, df: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError('p must be in (0, 1)');
  if (!(df > 0)) throw new RangeError('degrees of freedom must be positive');
  return studentTInv(p, df);
}
