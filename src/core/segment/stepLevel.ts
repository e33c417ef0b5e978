/**
 * Where the rim/core boundary sits on one ray's sampled profile (segment/refine.ts): the level between
 * the rim's and the core's pooled levels ({@link stepLevel}, with the tolerance ends of the parameter
 * range) and the search for it — the midpoint crossing of a box-averaged energy ({@link boxCrossing})
 * or the two-level step fit of a log arc-variance profile ({@link stepFit}).
 */

/** Sampling step along a ray, px. */
export const STEP = 0.5;

/**
 * 'box': the ends of the level's tolerance, as a fraction of the step from its midpoint: 'log' puts
 * the level at 0.5 − this of the way from the rim's to the core's level, 'std' at 0.5 + this. The
 * box mean is linear in the area fraction, so for a sharp step the midpoint is unbiased; but where
 * the brightness changes across a blend of the two surfaces (a roughness ramp, a defocused step)
 * it is not linear in the blend, and where on the ramp the boundary lies is not known from the
 * brightness alone. Measured on our renderer under a light from 75–85° (11 scenes where the tone
 * cue was taken, 2026-12-03): the mean width moves ≈ 2 % per 0.1 of the step and the true boundary
 * sat between 0.5 and ≈ 0.75 of it (midpoint: +0.3 … −4.6 %); the ends at ±0.1 give those scenes a
 * level spread h of ≈ 2 % of the width. An assumption of the same kind as the step fit's two ends,
 * checked on one generator only.
 */
export const BOX_LEVEL_TOLERANCE = 0.1;

/**
 * The level the boundary is put at. 'box': midpoint of the linear energy levels (the ends of its
 * tolerance: {@link BOX_LEVEL_TOLERANCE}). 'step': the
 * profile is a log-variance (robust to outliers); the level is the mean of two midpoints — of the
 * log-variances (geometric mean of the variances) and of the standard deviations mapped back to
 * log-variance. Across a fuzzy boundary where the two textures blend as b·core + (1 − b)·rim the
 * variance is b²V_c + (1 − b)²V_r: the log midpoint is reached before b = ½ (towards the rim), the
 * std midpoint after it (towards the core). Measured on two independent synthetic generators
 * (src/core/render and scripts/fixtures/make_external_fractographs.py) the first sat 0.6 px
 * rimward / ~0.1 px, the second 0.2 px / 0.7 px coreward; their mean stays within ~0.3 px on both
 * (single-ray fits; fitted to the pooled profile, segment/rayPool.ts, it sits 0.33 px rimward on plain).
 */
export function stepLevel(eR: number, eC: number, method: 'step' | 'box', level: 'mean' | 'log' | 'std' = 'mean'): number {
  if (method === 'box') {
    if (level === 'mean') return 0.5 * (eR + eC);
    return eR + (level === 'log' ? 0.5 - BOX_LEVEL_TOLERANCE : 0.5 + BOX_LEVEL_TOLERANCE) * (eC - eR);
  }
  const logMid = 0.5 * (eR + eC);
  const stdMid = 2 * Math.log(0.5 * (Math.exp(eR / 2) + Math.exp(eC / 2)));
  return level === 'log' ? logMid : level === 'std' ? stdMid : 0.5 * (logMid + stdMid);
}

/** 'box': the downward midpoint crossing in [k0, k1] nearest the coarse radius c (px), or null. */
export function boxCrossing(p: Float64Array, mid: number, k0: number, k1: number, c: number): number | null {
  let best: number | null = null;
  for (let k = k0; k <= k1; k++) {
    const a = p[k - 1] - mid;
    const b = p[k] - mid;
    if (a >= 0 && b < 0) {
      const t = (k - 1 + a / (a - b)) * STEP;
      if (best === null || Math.abs(t - c) < Math.abs(best - c)) best = t;
    }
  }
  return best;
}

/**
 * 'step': two-level step fit with the levels fixed: cost(b) = const + 2(Lc − Lr)·Σ_{t<b}(mid − q(t)),
 * so b is the argmin of the running sum of (mid − q); sub-sample position by linear interpolation
 * of the midpoint crossing next to it. Null when the step sits at the search edge.
 */
export function stepFit(p: Float64Array, mid: number, k0: number, k1: number): number | null {
  if (!(k1 > k0)) return null;
  let run = 0;
  let minRun = 0;
  let kMin = k0;
  for (let k = k0; k <= k1; k++) {
    // a gap in the profile (texture unknown there) is no evidence either way
    if (Number.isNaN(p[k])) continue;
    run += mid - p[k];
    if (run < minRun) {
      minRun = run;
      kMin = k + 1;
    }
  }
  if (!(kMin > k0 && kMin <= k1)) return null;
  const a = p[kMin - 1] - mid;
  const b = p[kMin] - mid;
  const frac = a > 0 && b < 0 ? a / (a - b) : 0.5;
  return (kMin - 1 + frac) * STEP;
}
