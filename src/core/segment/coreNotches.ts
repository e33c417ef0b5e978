/**
 * Notches of the coarse core outline before the boundary refinement (segment/refine.ts): a coarse
 * radius far inside its neighbours' is raised to their upper quartile so the search reaches the step.
 */
/** Rays either side over which the coarse radius is compared (±45° at 360 rays). */
const NOTCH_HALF_SECTOR_DEG = 45;
/**
 * A coarse radius more than max(NOTCH_DEPTH_WINDOWS windows, NOTCH_DEPTH_RADIUS × that radius) below
 * its neighbourhood's upper quartile is a notch in the core (the radius part keeps the ragged coarse
 * outline of a narrow, noisy band, found with a small window, as it is).
 */
const NOTCH_DEPTH_WINDOWS = 2;
const NOTCH_DEPTH_RADIUS = 0.1;

/**
 * Notches of the coarse core outline: where the classification left a deep inward notch in the
 * core (a part of the core that reads smooth, e.g. out of focus on a tilted specimen), the coarse
 * radius lies far inside the rest of the outline around it, out of reach of the search. Such a
 * radius (more than NOTCH_DEPTH_WINDOWS windows and 10 % below the upper quartile of the coarse radii within
 * ±NOTCH_HALF_SECTOR_DEG, leaving out rays where the core comes within a window of the outer edge,
 * and only where at least half of the rays around have a band) is replaced by that quartile; the
 * search then finds the step near it.
 * Only inward: where the core reaches the outer edge (the band is absent there) nothing changes.
 */
export function fillCoreNotches(c: (number | null)[], o: (number | null)[], W: number): (number | null)[] {
  const n = c.length;
  const h = Math.max(1, Math.round((NOTCH_HALF_SECTOR_DEG * n) / 360));
  // the rays that say something about the core's outline, and their radii (NaN for the others)
  const known = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const v = c[k];
    const ov = o[k];
    known[k] = v !== null && ov !== null && v < ov - W ? v : NaN;
  }
  const w = new Float64Array(2 * h + 1);
  return c.map((ci, i) => {
    if (ci === null) return null;
    // rays where the core reaches the outer edge (no band there) say nothing about the core's outline
    const m = gatherKnown(known, i, h, w);
    if (m < h) return ci;
    // the typed array's own numeric sort: the same order statistics as sorting a number[] with
    // (a, b) => a − b (radii, never NaN; ±0 would only differ in a sign no use of q75 sees)
    const sorted = w.subarray(0, m).sort();
    const q75 = sorted[Math.floor(0.75 * (m - 1))];
    return ci < q75 - Math.max(NOTCH_DEPTH_WINDOWS * W, NOTCH_DEPTH_RADIUS * q75) ? q75 : ci;
  });
}

/** The known radii of the rays i − h … i + h (circular) into w; their number. */
function gatherKnown(known: Float64Array, i: number, h: number, w: Float64Array): number {
  const n = known.length;
  let m = 0;
  for (let j = -h; j <= h; j++) {
    const v = known[(i + j + n) % n];
    if (v === v) w[m++] = v;
  }
  return m;
}
