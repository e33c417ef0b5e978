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
  return c.map((ci, i) => {
    if (ci === null) return null;
    // rays where the core reaches the outer edge (no band there) say nothing about the core's outline
    const w: number[] = [];
    for (let j = -h; j <= h; j++) {
      const k = (i + j + n) % n;
      const v = c[k];
      const ov = o[k];
      if (v !== null && ov !== null && v < ov - W) w.push(v);
    }
    if (w.length < h) return ci;
    w.sort((a, b) => a - b);
    const q75 = w[Math.floor(0.75 * (w.length - 1))];
    return ci < q75 - Math.max(NOTCH_DEPTH_WINDOWS * W, NOTCH_DEPTH_RADIUS * q75) ? q75 : ci;
  });
}
