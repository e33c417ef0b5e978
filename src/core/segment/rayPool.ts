/**
 * The step fit's profile pooled over neighbouring rays (segment/refine.ts): at each radius, the
 * median of the log arc variances of the rays whose arcs lie within ± a window of arc length.
 *
 * Why: one ray's profile is the log variance of one short arc per radius (a window's width of
 * samples, strongly correlated from one radius to the next), a log-χ² quantity of few degrees of
 * freedom: wide, with a long tail to LOW values (an arc that happens to be smooth). The step fit
 * (argmin of the running sum of mid − q) finds a false minimum on the core side where a run of
 * core arcs dips below the level, and on the rim side where a run of rim arcs rises above it; the
 * long low tail makes the first far more likely, so where rim and core differ by little against
 * that spread (weak core contrast, a rim whose variance is mostly noise) the single-ray steps have
 * a long coreward tail: on the SEM scene of our set (core/rim variance 2 : 1) they sat −1.4 px from
 * the truth on average, median −0.25 px, 10 % of them beyond −8.7 px, and the 5-ray running median
 * of the steps kept most of it (−1.2 px, +3.5 % width), because neighbouring rays share pixels and
 * their false minima. The median over the neighbouring rays at each radius takes the tail out
 * before the fit (the median of a few log-χ² values is nearly symmetric, and narrower); the step of
 * the median profile over all rays sat within 0.5 px of the truth on the same images (ours and
 * the independent generator's noisy and SEM images).
 *
 * A radius where the ray's own profile has a gap (texture unknown there, e.g. glints) stays a gap:
 * the neighbours' values are no evidence for this ray there.
 */

/**
 * Default pooling of the step fit's profile over neighbouring rays, in windows of arc length each
 * side (`refineBoundary` option `poolWindows`). Our choice: ±1 window is ±2–3 rays at the default window (1/25 of the
 * radius) and 360 rays; it took the SEM scene from +3.5 % to +1.5 % and the independent noisy JPEG
 * from +2.1 % to +1.6 %; ±2 rays left the SEM scene at +2.0 %. Not applied where glint pixels are
 * left out (`missing`): the glint thresholds (segment/glints.ts) were measured with the single-ray
 * fit, and on a densely sparkling rim (glints-b) the pooled fit shows their remains' rimward pull
 * that the single-ray fit's coreward tail had offset (−1.4 % → −2.5 %); open until they are
 * measured again.
 */
export const POOL_WINDOWS = 1;

/**
 * Rays on each side whose arcs lie within ±`windows` windows of arc length at radius `radiusPx`
 * (at most 5° on each side).
 */
export function poolHalfRays(windows: number, windowPx: number, nRays: number, radiusPx: number): number {
  if (!(windows > 0) || !(radiusPx > 0)) return 0;
  const spacingPx = (2 * Math.PI * radiusPx) / nRays;
  return Math.max(0, Math.min(Math.floor(nRays / 72), Math.round((windows * windowPx) / spacingPx)));
}

/**
 * Pooled profile of ray i at the indices k0 − 1 … k1 (NaN elsewhere): the median of the rays
 * i − half … i + half (circular) at each index, leaving out their gaps (NaN); NaN where ray i's own
 * profile has a gap.
 * @param profiles - every ray's profile (NaN where unknown), all sampled at the same radii
 * @param i - the ray
 * @param half - rays on each side (0: the ray's own profile, returned as it is)
 * @param k0 - first index of the search
 * @param k1 - last index of the search
 */
export function pooledProfile(profiles: readonly Float64Array[], i: number, half: number, k0: number, k1: number): Float64Array {
  const n = profiles.length;
  const own = profiles[i];
  if (half <= 0) return own;
  const out = new Float64Array(own.length).fill(NaN);
  const rays: Float64Array[] = [];
  for (let j = -half; j <= half; j++) rays.push(profiles[(((i + j) % n) + n) % n]);
  pooledInto(rays, own, Math.max(0, k0 - 1), Math.min(own.length - 1, k1), new Float64Array(rays.length), out);
  return out;
}

/**
 * out[k] for k = from … to: the median of the rays' known values at k (NaN where `own` has a gap
 * or no ray has a value). The values are insertion-sorted into `w` (at most 2·half + 1 of them):
 * the same median as medianOf (simple-statistics: the middle order statistic, or the mean of the
 * two middle ones, (a + b) / 2) without an array and a copy per radius. Order statistics are the
 * same values whichever way they are found (the profiles are logarithms, never −0).
 */
function pooledInto(rays: readonly Float64Array[], own: Float64Array, from: number, to: number, w: Float64Array, out: Float64Array): void {
  for (let k = from; k <= to; k++) {
    if (Number.isNaN(own[k])) continue;
    let m = 0;
    for (let j = 0; j < rays.length; j++) {
      const p = rays[j];
      if (k >= p.length) continue;
      const v = p[k];
      if (Number.isNaN(v)) continue;
      let q = m++;
      while (q > 0 && w[q - 1] > v) {
        w[q] = w[q - 1];
        q--;
      }
      w[q] = v;
    }
    out[k] = m === 0 ? NaN : m & 1 ? w[m >> 1] : (w[m / 2 - 1] + w[m / 2]) / 2;
  }
}
