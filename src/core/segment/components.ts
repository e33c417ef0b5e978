/**
 * 8-connected components of a mask: the labelling (one `cv.connectedComponentsWithStats` per mask,
 * its outputs read while OpenCV still holds them) and the choice of one component. A mask that is
 * never changed (the cached coarse foreground) is labelled once: `listSpecimens` sorts its
 * components and `findSpecimen` keeps one of the same mask, which were two labellings of the same
 * pixels (issue 16).
 */
import { getCv } from '../cv.js';
import type { PointPx } from '../image/geometry.js';
import { createMask, type Mask } from '../image/raster.js';
import { maskToMat } from './cvutil.js';

/** The output of `cv.connectedComponentsWithStats(mask, 8, CV_32S)`. */
export interface Labelled {
  /** Number of labels, background (0) included. */
  n: number;
  labels: Int32Array;
  /** n × 5 (CC_STAT_LEFT, TOP, WIDTH, HEIGHT, AREA). */
  stats: Int32Array;
  /** n × 2 centroids (x, y). */
  cents: Float64Array;
}

/** Columns of {@link Labelled.stats} (cv.CC_STAT_LEFT, _TOP, _WIDTH, _HEIGHT, _AREA). */
export const STAT_LEFT = 0;
export const STAT_TOP = 1;
export const STAT_WIDTH = 2;
export const STAT_HEIGHT = 3;
export const STAT_AREA = 4;

/**
 * Labels `mask` and hands the result to `use` while OpenCV still holds it: `labels` and `stats` are
 * views into OpenCV's memory, valid only inside `use` (copy what must outlive the call).
 */
function withComponents<T>(mask: Mask, use: (c: Labelled) => T): T {
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
    return use({ n, labels: labels.data32S as Int32Array, stats: stats.data32S as Int32Array, cents: c });
  } finally {
    m.delete();
    labels.delete();
    stats.delete();
    cents.delete();
  }
}

const LABELLED = new WeakMap<Mask, Labelled>();

/**
 * The components of `mask`, computed once per mask object: only for masks that are never written
 * to after the first call (the coarse foregrounds of foreground.ts and severalSpecimens.ts).
 */
export function labelledComponents(mask: Mask): Labelled {
  const hit = LABELLED.get(mask);
  if (hit) return hit;
  const out = withComponents(mask, (c) => ({ ...c, labels: new Int32Array(c.labels), stats: new Int32Array(c.stats) }));
  LABELLED.set(mask, out);
  return out;
}

/**
 * Keep one connected component (8-connectivity): among components of at least `minFraction` of
 * the largest one, the one whose centroid is nearest `target` (or containing it). Returns the
 * kept mask, or null when the mask is empty.
 */
export function keepComponent(mask: Mask, target: PointPx, minFraction = 0.25): Mask | null {
  return withComponents(mask, (c) => keptOf(c, mask, target, minFraction));
}

/** {@link keepComponent} from the labelling of {@link labelledComponents} (the mask labelled once for several callers). */
export function keepLabelled(mask: Mask, target: PointPx, minFraction = 0.25): Mask | null {
  return keptOf(labelledComponents(mask), mask, target, minFraction);
}

/** The kept component of a labelling as a mask (see {@link keepComponent}), or null when the mask is empty. */
function keptOf({ n, labels, stats, cents }: Labelled, mask: Mask, target: PointPx, minFraction: number): Mask | null {
  if (n <= 1) return null;
  const best = chosenComponent(n, (l) => stats[l * 5 + STAT_AREA], (l) => ({ x: cents[2 * l], y: cents[2 * l + 1] }), labels, mask.width, mask.height, target, minFraction);
  const out = createMask(mask.width, mask.height);
  labelMask(labels, best, out.data);
  return out;
}

/**
 * The component {@link keepComponent} keeps among labels 1 … n − 1 (`lab` the label image, W × H):
 * the one under the target pixel when its area is at least `minFraction` of the largest, else the
 * one of those whose centroid is nearest the target; −1 when there is none.
 */
function chosenComponent(n: number, area: (l: number) => number, centroid: (l: number) => PointPx, lab: Int32Array, W: number, H: number, target: PointPx, minFraction: number): number {
  let maxA = 0;
  for (let l = 1; l < n; l++) maxA = Math.max(maxA, area(l));
  const tx = Math.min(W - 1, Math.max(0, Math.round(target.x)));
  const ty = Math.min(H - 1, Math.max(0, Math.round(target.y)));
  const atTarget = lab[ty * W + tx];
  if (atTarget > 0 && area(atTarget) >= minFraction * maxA) return atTarget;
  let best = -1;
  let bestD = Infinity;
  for (let l = 1; l < n; l++) {
    if (area(l) < minFraction * maxA) continue;
    const c = centroid(l);
    const d = Math.hypot(c.x - target.x, c.y - target.y);
    if (d < bestD) {
      bestD = d;
      best = l;
    }
  }
  return best;
}

/**
 * out[i] = 1 where lab[i] = label, else 0. A loop of its own: inside `keepComponent` V8 reached it
 * only by on-stack replacement (self time ≈ 130 ms in a 12-MP profile, issue 16).
 */
function labelMask(lab: Int32Array, label: number, out: Uint8Array): void {
  for (let i = 0; i < lab.length; i++) out[i] = lab[i] === label ? 1 : 0;
}
