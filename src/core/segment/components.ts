/**
 * The 8-connected components of a mask that is never changed (the cached coarse foreground), labelled
 * once: `listSpecimens` sorts them and `findSpecimen` keeps one of the same mask, which were two
 * `cv.connectedComponentsWithStats` calls on the same pixels (issue 16).
 */
import { getCv } from '../cv.js';
import type { PointPx } from '../image/geometry.js';
import { createMask, type Mask } from '../image/raster.js';
import { chosenComponent, labelMask, maskToMat } from './cvutil.js';

/** The output of `cv.connectedComponentsWithStats(mask, 8, CV_32S)`, copied out of OpenCV. */
export interface Labelled {
  /** Number of labels, background (0) included. */
  n: number;
  labels: Int32Array;
  /** n × 5 (CC_STAT_LEFT, TOP, WIDTH, HEIGHT, AREA). */
  stats: Int32Array;
  /** n × 2 centroids (x, y). */
  cents: Float64Array;
}

const LABELLED = new WeakMap<Mask, Labelled>();

/** Columns of {@link Labelled.stats} (cv.CC_STAT_LEFT, _TOP, _WIDTH, _HEIGHT, _AREA). */
export const STAT_LEFT = 0;
export const STAT_TOP = 1;
export const STAT_WIDTH = 2;
export const STAT_HEIGHT = 3;
export const STAT_AREA = 4;

/**
 * The components of `mask`, computed once per mask object: only for masks that are never written
 * to after the first call (the coarse foregrounds of foreground.ts and severalSpecimens.ts).
 */
export function labelledComponents(mask: Mask): Labelled {
  const hit = LABELLED.get(mask);
  if (hit) return hit;
  const cv = getCv();
  const m = maskToMat(mask);
  const labels = new cv.Mat();
  const stats = new cv.Mat();
  const cents = new cv.Mat();
  try {
    const n = cv.connectedComponentsWithStats(m, labels, stats, cents, 8, cv.CV_32S) as number;
    const c = new Float64Array(2 * n);
    for (let l = 0; l < n; l++) {
      c[2 * l] = cents.doubleAt(l, 0);
      c[2 * l + 1] = cents.doubleAt(l, 1);
    }
    const out: Labelled = { n, labels: new Int32Array(labels.data32S), stats: new Int32Array(stats.data32S), cents: c };
    LABELLED.set(mask, out);
    return out;
  } finally {
    m.delete();
    labels.delete();
    stats.delete();
    cents.delete();
  }
}

/**
 * `keepComponent(mask, target, minFraction)` (cvutil.ts) from the labelling of
 * {@link labelledComponents}: the same choice, step for step — the component holding the target
 * pixel when it has at least `minFraction` of the largest area, else the one of those whose
 * centroid is nearest the target. Null when the mask is empty.
 */
export function keepLabelled(mask: Mask, target: PointPx, minFraction = 0.25): Mask | null {
  const { n, labels, stats, cents } = labelledComponents(mask);
  if (n <= 1) return null;
  const best = chosenComponent(n, (l) => stats[l * 5 + STAT_AREA], (l) => ({ x: cents[2 * l], y: cents[2 * l + 1] }), labels, mask.width, mask.height, target, minFraction);
  const out = createMask(mask.width, mask.height);
  labelMask(labels, best, out.data);
  return out;
}
