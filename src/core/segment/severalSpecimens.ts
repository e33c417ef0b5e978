/**
 * Several specimens in one frame (both mating halves side by side, or a row): the list of them,
 * and the foreground with touching ones cut apart, so that `findSpecimen` with a target outlines one.
 */
import { getCv } from '../cv.js';
import type { BoxPx } from '../image/geometry.js';
import { createMask, type GrayRaster, type Mask } from '../image/raster.js';
import { coarseForeground, foregroundKey, type CoarseForeground, type ForegroundOptions } from './foreground.js';
import { oncePerRaster } from './memo.js';
import { labelledComponents, STAT_AREA, STAT_HEIGHT, STAT_LEFT, STAT_TOP, STAT_WIDTH } from './components.js';
import { maskToMat } from './cvutil.js';

/** Options of {@link listSpecimens}. */
export interface ListSpecimenOptions extends ForegroundOptions {
  /** Smallest area of a candidate as a fraction of the largest candidate (default 0.5). */
  minAreaRatio?: number;
}

/**
 * The specimens of an image when it holds several (both mating halves side by side, or a row of
 * specimens): boxes (px of `r`) of the components of the coarse foreground, touching specimens cut
 * apart ({@link separatedForeground}),
 * that look like a fracture surface seen end-on — compact (area / bounding box 0.6–0.9; a disc
 * fills π/4 ≈ 0.785, a rectangle such as a rule or a label ≈ 1), roughly round (bounding box sides
 * within 1 : 1.5), at least 0.2 % of the image — and of similar size (area ≥ `minAreaRatio` × the
 * largest such). Separate components never touch each other. Ordered left to right, or top to
 * bottom when they lie more above each other than side by side. Thresholds are our own first
 * choice (common practice, no source).
 *
 * @returns two or more boxes, or an empty list when the image holds one specimen (or none): then
 *   `findSpecimen` without a target gives the outline, as for any single specimen
 */
export function listSpecimens(r: GrayRaster, opts: ListSpecimenOptions = {}): BoxPx[] {
  const fg = separatedForeground(r, opts);
  const { sx, sy } = fg;
  const found = components(fg).round.map((c) => ({ box: { x: c.bx * sx, y: c.by * sy, w: c.bw * sx, h: c.bh * sy }, area: c.area, cx: (c.bx + c.bw / 2) * sx, cy: (c.by + c.bh / 2) * sy }));
  const maxA = Math.max(0, ...found.map((c) => c.area));
  const similar = found.filter((c) => c.area >= (opts.minAreaRatio ?? 0.5) * maxA);
  if (similar.length < 2) return [];
  const spread = (v: number[]): number => Math.max(...v) - Math.min(...v);
  const byX = spread(similar.map((c) => c.cx)) >= spread(similar.map((c) => c.cy));
  similar.sort((a, b) => (byX ? a.cx - b.cx || a.cy - b.cy : a.cy - b.cy || a.cx - b.cx));
  return similar.map((c) => c.box);
}


/** A compact, roughly round component of a coarse mask (coarse px). */
interface RoundComponent {
  area: number;
  bx: number;
  by: number;
  bw: number;
  bh: number;
}

/** The components of a coarse mask: round ones (possible specimens) and elongated ones (possibly two touching). */
interface Components {
  round: RoundComponent[];
  /** Large components with bounding-box sides 1 : 1.5 to 1 : 3.5 (two touching discs: 1 : 2). */
  elongated: number;
}

const COMPONENTS = new WeakMap<Mask, Components>();

/** The components that look like a fracture surface seen end-on (see {@link listSpecimens}); once per mask. */
function components(fg: CoarseForeground): Components {
  const hit = COMPONENTS.get(fg.mask);
  if (hit) return hit;
  const { w, h } = fg;
  // labelled once per mask: findSpecimen keeps one component of the same mask (components.ts)
  const { n, stats } = labelledComponents(fg.mask);
  const out: Components = { round: [], elongated: 0 };
  const at = (l: number, k: number): number => stats[l * 5 + k];
  for (let l = 1; l < n; l++) {
    const area = at(l, STAT_AREA);
    const bw = at(l, STAT_WIDTH);
    const bh = at(l, STAT_HEIGHT);
    if (area < 0.002 * w * h) continue;
    const aspect = Math.max(bw, bh) / Math.min(bw, bh);
    if (aspect > 1.5) {
      if (aspect <= 3.5) out.elongated++;
      continue;
    }
    const fill = area / (bw * bh);
    if (fill < 0.6 || fill > 0.9) continue;
    out.round.push({ area, bx: at(l, STAT_LEFT), by: at(l, STAT_TOP), bw, bh });
  }
  COMPONENTS.set(fg.mask, out);
  return out;
}

const SEPARATED = new WeakMap<GrayRaster, Map<string, CoarseForeground>>();

/**
 * The coarse foreground with touching round specimens cut apart (both halves laid side by side
 * touching, or closer than the smoothing joins): unchanged when two or more similar round
 * components are already separate, or when no component holds two round cores. Method: the
 * Euclidean distance to the background (cv.distanceTransform) of each component; its cores above
 * half the largest distance in the image are the bodies of the discs (looked for only when a
 * component is 1.5–3.5 times as long as wide), and a narrow neck between two
 * discs falls below; with two or more cores of similar depth (≥ 0.7 × the deepest) in one
 * component, each pixel of it goes to the core with the smallest distance to its centre minus its
 * depth (≈ the nearest disc), and pixels within 1.5 px of a tie are cleared so the pieces are
 * separate components. Computed once per raster and options.
 */
export function separatedForeground(r: GrayRaster, opts: ForegroundOptions = {}): CoarseForeground {
  return oncePerRaster(SEPARATED, r, foregroundKey(opts), () => {
    const fg = coarseForeground(r, opts);
    const { round, elongated } = components(fg);
    const maxA = Math.max(0, ...round.map((c) => c.area));
    const separate = round.filter((c) => c.area >= 0.5 * maxA).length >= 2;
    // only a component as long as two touching discs can hold two (the usual single round specimen: none)
    const split = separate || elongated === 0 ? null : splitTouching(fg);
    return split ? { ...fg, mask: split } : fg;
  });
}

/** The mask with touching discs cut apart, or null when no component holds two similar round cores. */
function splitTouching(fg: CoarseForeground): Mask | null {
  const cv = getCv();
  const { w, h } = fg;
  const src = maskToMat(fg.mask);
  const dist = new cv.Mat();
  const comp = new cv.Mat();
  const coreMat = new cv.Mat();
  const coreLab = new cv.Mat();
  const stats = new cv.Mat();
  const cents = new cv.Mat();
  try {
    cv.distanceTransform(src, dist, cv.DIST_L2, 5);
    const d = dist.data32F as Float32Array;
    let maxD = 0;
    for (let i = 0; i < d.length; i++) if (d[i] > maxD) maxD = d[i];
    if (!(maxD > 4)) return null;
    const core = createMask(w, h);
    for (let i = 0; i < d.length; i++) core.data[i] = d[i] > 0.5 * maxD ? 1 : 0;
    const cm = maskToMat(core);
    try {
      cm.copyTo(coreMat);
    } finally {
      cm.delete();
    }
    const n = cv.connectedComponentsWithStats(coreMat, coreLab, stats, cents, 8, cv.CV_32S);
    const cl = coreLab.data32S as Int32Array;
    // depth (largest distance) and the point where it is reached, per core
    const depth = new Float64Array(n);
    const at = new Int32Array(n).fill(-1);
    for (let i = 0; i < cl.length; i++) {
      const l = cl[i];
      if (l > 0 && d[i] > depth[l]) {
        depth[l] = d[i];
        at[l] = i;
      }
    }
    const cores: { l: number; x: number; y: number; depth: number }[] = [];
    for (let l = 1; l < n; l++) {
      const bw = stats.intAt(l, cv.CC_STAT_WIDTH);
      const bh = stats.intAt(l, cv.CC_STAT_HEIGHT);
      if (depth[l] < 0.7 * maxD || Math.max(bw, bh) > 1.5 * Math.min(bw, bh)) continue;
      cores.push({ l, x: at[l] % w, y: Math.floor(at[l] / w), depth: depth[l] });
    }
    if (cores.length < 2) return null;
    // the components of the foreground holding two or more of these cores
    cv.connectedComponentsWithStats(src, comp, stats, cents, 8, cv.CV_32S);
    const lab = comp.data32S as Int32Array;
    const count = new Map<number, number>();
    for (const c of cores) count.set(lab[c.y * w + c.x], (count.get(lab[c.y * w + c.x]) ?? 0) + 1);
    const shared = new Set([...count].filter(([, k]) => k >= 2).map(([l]) => l));
    if (!shared.size) return null;
    const out = createMask(w, h);
    out.data.set(fg.mask.data);
    for (let i = 0; i < lab.length; i++) {
      if (!shared.has(lab[i])) continue;
      const x = i % w;
      const y = Math.floor(i / w);
      let best = Infinity;
      let second = Infinity;
      for (const c of cores) {
        if (lab[c.y * w + c.x] !== lab[i]) continue;
        const v = Math.hypot(x - c.x, y - c.y) - c.depth;
        if (v < best) {
          second = best;
          best = v;
        } else if (v < second) second = v;
      }
      if (second - best < 1.5) out.data[i] = 0;
    }
    return out;
  } finally {
    src.delete();
    dist.delete();
    comp.delete();
    coreMat.delete();
    coreLab.delete();
    stats.delete();
    cents.delete();
  }
}
