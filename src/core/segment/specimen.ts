/**
 * Specimen outline: separate the fracture surface from a dark or bright background, fill holes,
 * keep the specimen component, trace its outer contour and fit a circle and an ellipse.
 */
import { getCv, type Mat } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createMask, type GrayRaster, type Mask } from '../image/raster.js';
import type { BoxPx, PointPx } from '../image/geometry.js';
import { fillHoles, keepComponent, maskToMat, matToMask, morphDisc, otsuThreshold, outerContour, quantile, quantiles, rasterToMat, rectMorph } from './cvutil.js';
import { type CircleFit, type EllipseFit, fitCircle, fitEllipseToPoints } from './fit.js';
import { inBoxes } from '../measure/geometry.js';

/** Options of {@link findSpecimen}. */
export interface SpecimenOptions {
  /** Longest side of the working image for the coarse segmentation (default 1024 px). */
  workSizePx?: number;
  /** Use local texture as well as intensity to find the surface (default true). */
  useTexture?: boolean;
  /** Components smaller than this fraction of the largest are ignored (default 0.25). */
  minComponentFraction?: number;
  /**
   * Boxes (px of `r`) whose contour points are left out of the circle and ellipse fits, like
   * points on the frame: painted-out scale marks, where the outline is the mark's, not the
   * specimen's (default none).
   */
  excludeBoxes?: readonly BoxPx[];
  /**
   * The specimen to outline when the image holds several (a box from {@link listSpecimens}, px of
   * `r`): the component at the box centre is kept instead of the one at the image centre, however
   * small it is beside the largest.
   */
  target?: BoxPx;
}

/** Result of {@link findSpecimen}; all coordinates px at full resolution. */
export interface Specimen {
  mask: Mask;
  /** Outer contour, every boundary pixel (pixel centres of the outermost specimen pixels). */
  contour: PointPx[];
  circle: CircleFit;
  ellipse: EllipseFit;
  areaPx: number;
  /** √(area/π), px. */
  equivalentRadiusPx: number;
  background: 'dark' | 'bright';
  touchesFrame: boolean;
  /** Fraction of contour points lying on the image frame (excluded from the fits). */
  frameContactFraction: number;
  /** Intensity level (0..1) separating background and surface at full resolution. */
  thresholdLevel: number;
}

/**
 * Find the specimen (fracture surface) in a fractograph.
 *
 * Method: (1) downsample to ≤ workSizePx (area average) and smooth (Gaussian σ = 1.5 px);
 * (2) Otsu threshold (Otsu 1979) of the intensity; the background polarity is the class holding
 * most of the image border; (3) optionally add pixels whose local standard deviation (7 px box)
 * is clearly above the background's (Otsu on log-std and > 3× the border median), so a textured
 * surface darker/brighter than the background in places is kept; (4) close, fill holes (pits and
 * macro-cracks inside the section become specimen), open; (5) keep the component of at least
 * `minComponentFraction` of the largest that contains / is nearest the image centre (so a
 * scale-bar plate in a corner is not taken); (6) at full resolution, pixels within a few px of the
 * coarse edge are re-decided by the intensity threshold on a lightly smoothed image (σ = 1 px),
 * keeping the outline accurate to ~1 px; (7) outer contour by cv.findContours, circle (Kåsa +
 * geometric refinement) and ellipse (cv.fitEllipse) fitted to contour points not on the frame.
 *
 * @param r - gray raster 0..1, full resolution
 * @param opts - see {@link SpecimenOptions}
 * @returns the specimen outline and fits
 * @throws FractozoneError NO_SPECIMEN when no surface is found
 */
export function findSpecimen(r: GrayRaster, opts: SpecimenOptions = {}): Specimen {
  const W = r.width;
  const H = r.height;
  const fg = coarseForeground(r, opts);
  const { w, h, sx, sy, level, bright } = fg;
  // the component at the image centre, or at the centre of the target box (in coarse px)
  const t = opts.target;
  const aim = t ? { x: (t.x + t.w / 2 + 0.5) / sx - 0.5, y: (t.y + t.h / 2 + 0.5) / sy - 0.5 } : { x: (w - 1) / 2, y: (h - 1) / 2 };
  // a target was vetted as a specimen by listSpecimens: kept whatever the size of other objects
  // (a rule along the frame can be several times larger)
  const kept = keepComponent(fg.mask, aim, t ? 0 : (opts.minComponentFraction ?? 0.25));
  if (!kept) throw new FractozoneError('NO_SPECIMEN', 'No specimen was found: the image holds no region that differs from the background.');
  const coarse = kept;
  fillHoles(coarse);
  // band: the texture window (7 px) + smoothing can push the coarse edge ~6 work px outwards
  const mask = refineAtFullResolution(r, coarse, level, bright, Math.ceil(8 * Math.max(sx, sy)) + 2);
  let area = 0;
  for (let i = 0; i < mask.data.length; i++) area += mask.data[i];
  if (area < 0.002 * W * H) throw new FractozoneError('NO_SPECIMEN', 'No specimen was found: the only regions found are too small.');
  const contour = outerContour(mask);
  const onFrame = (p: PointPx): boolean => p.x <= 0 || p.y <= 0 || p.x >= W - 1 || p.y >= H - 1;
  const inner = contour.filter((p) => !onFrame(p));
  const frameContactFraction = contour.length ? 1 - inner.length / contour.length : 0;
  const marks = opts.excludeBoxes ?? [];
  const fitPts = marks.length ? inner.filter((p) => !inBoxes(marks, p.x, p.y, 2)) : inner;
  // a fit needs enough of the outline; if the marks would leave too little, keep them in
  const use = fitPts.length >= Math.max(16, 0.5 * inner.length) ? fitPts : inner;
  const circle = fitCircle(use);
  const ellipse = fitEllipseToPoints(use);
  if (!circle || !ellipse) throw new FractozoneError('NO_SPECIMEN', 'The specimen outline is too short to fit a circle or ellipse.');
  return {
    mask, contour, circle, ellipse, areaPx: area, equivalentRadiusPx: Math.sqrt(area / Math.PI),
    background: bright ? 'bright' : 'dark', touchesFrame: frameContactFraction > 0, frameContactFraction,
    thresholdLevel: level,
  };
}

/** The coarse foreground of {@link findSpecimen}: every region that differs from the background. */
export interface CoarseForeground {
  /** Foreground on the coarse grid (closed, holes filled, opened), all components. */
  mask: Mask;
  /** Size of the coarse grid and px of the input per coarse px. */
  w: number;
  h: number;
  sx: number;
  sy: number;
  /** Intensity level (0..1) separating background and surface. */
  level: number;
  /** The background is the bright class. */
  bright: boolean;
}

/**
 * The foregrounds computed, per raster and options: `listSpecimens` and then `findSpecimen` (once
 * per specimen) on the same working copy compute it once. Rasters are not changed in place in core;
 * the cached mask is never written to (callers copy it).
 */
const FOREGROUNDS = new WeakMap<GrayRaster, Map<string, CoarseForeground>>();

/**
 * Steps (1)–(4) of {@link findSpecimen}: the foreground of every object on a coarse grid (computed
 * once per raster and options; do not write to the returned mask).
 * @throws FractozoneError NO_SPECIMEN when the image is too small or has no contrast
 */
export function coarseForeground(r: GrayRaster, opts: Pick<SpecimenOptions, 'workSizePx' | 'useTexture'> = {}): CoarseForeground {
  const key = `${opts.workSizePx ?? 1024}|${opts.useTexture ?? true}`;
  const known = FOREGROUNDS.get(r);
  const hit = known?.get(key);
  if (hit) return hit;
  const fg = computeForeground(r, opts);
  if (known) known.set(key, fg);
  else FOREGROUNDS.set(r, new Map([[key, fg]]));
  return fg;
}

function computeForeground(r: GrayRaster, opts: Pick<SpecimenOptions, 'workSizePx' | 'useTexture'>): CoarseForeground {
  const cv = getCv();
  const W = r.width;
  const H = r.height;
  if (W < 16 || H < 16) throw new FractozoneError('NO_SPECIMEN', `The image (${W}×${H} px) is too small to hold a specimen.`);
  const work = opts.workSizePx ?? 1024;
  const f = Math.max(1, Math.max(W, H) / work);
  const w = Math.max(8, Math.round(W / f));
  const h = Math.max(8, Math.round(H / f));
  const sx = W / w;
  const sy = H / h;

  const full = rasterToMat(r);
  const small = new cv.Mat();
  try {
    if (w !== W || h !== H) cv.resize(full, small, new cv.Size(w, h), 0, 0, cv.INTER_AREA);
    else full.copyTo(small);
    cv.GaussianBlur(small, small, new cv.Size(0, 0), 1.5, 1.5, cv.BORDER_REFLECT_101);
    const sd = small.data32F as Float32Array;
    const [lo, hi] = quantiles(sd, [0.001, 0.999]);
    if (!(hi - lo > 1e-4)) throw new FractozoneError('NO_SPECIMEN', 'The image has no contrast: no specimen can be separated from the background.');
    let level = otsuThreshold(sd, lo, hi);
    // border polarity
    let nb = 0;
    let nBright = 0;
    const border: number[] = [];
    for (let x = 0; x < w; x++) for (const y of [0, h - 1]) { border.push(sd[y * w + x]); }
    for (let y = 1; y < h - 1; y++) for (const x of [0, w - 1]) { border.push(sd[y * w + x]); }
    for (const v of border) {
      nb++;
      if (v > level) nBright++;
    }
    const bright = nBright > nb / 2;
    // move the level halfway towards the background median: a surface part that is shaded
    // darker (or brighter) than most of the surface but still differs from the background is kept
    const bgMed = quantile(border, 0.5);
    level = 0.5 * (level + bgMed);
    const m = createMask(w, h);
    for (let i = 0; i < sd.length; i++) m.data[i] = (sd[i] > level) !== bright ? 1 : 0;
    if (opts.useTexture ?? true) addTexture(small, m, border.length, w, h);
    let mask: Mask;
    const mm = maskToMat(m);
    try {
      const rad = Math.max(1, Math.round(Math.min(w, h) / 300));
      morphDisc(mm, 'close', rad * 2);
      const tmp = matToMask(mm);
      fillHoles(tmp);
      const mm2 = maskToMat(tmp);
      try {
        morphDisc(mm2, 'open', rad * 2);
        mask = matToMask(mm2);
      } finally {
        mm2.delete();
      }
    } finally {
      mm.delete();
    }
    return { mask, w, h, sx, sy, level, bright };
  } finally {
    full.delete();
    small.delete();
  }
}

/** Options of {@link listSpecimens}. */
export interface ListSpecimenOptions extends Pick<SpecimenOptions, 'workSizePx' | 'useTexture'> {
  /** Smallest area of a candidate as a fraction of the largest candidate (default 0.5). */
  minAreaRatio?: number;
}

/**
 * The specimens of an image when it holds several (both mating halves side by side, or a row of
 * specimens): boxes (px of `r`) of the components of the coarse foreground ({@link coarseForeground})
 * that look like a fracture surface seen end-on — compact (area / bounding box 0.6–0.9; a disc
 * fills π/4 ≈ 0.785, a rectangle such as a rule or a label ≈ 1), roughly round (bounding box sides
 * within 1 : 1.5), at least 0.2 % of the image — and of similar size (area ≥ `minAreaRatio` × the
 * largest such). Separate components never touch each other. Ordered left to right, or top to
 * bottom when they lie more above each other than side by side. Thresholds are our own first
 * choice (common practice, no source).
 *
 * @returns two or more boxes, or an empty list when the image holds one specimen (or none): then
 *   {@link findSpecimen} without a target gives the outline, as for any single specimen
 */
export function listSpecimens(r: GrayRaster, opts: ListSpecimenOptions = {}): BoxPx[] {
  const cv = getCv();
  const fg = coarseForeground(r, opts);
  const { w, h, sx, sy } = fg;
  const m = maskToMat(fg.mask);
  const labels = new cv.Mat();
  const stats = new cv.Mat();
  const cents = new cv.Mat();
  const found: { box: BoxPx; area: number; cx: number; cy: number }[] = [];
  try {
    const n = cv.connectedComponentsWithStats(m, labels, stats, cents, 8, cv.CV_32S);
    for (let l = 1; l < n; l++) {
      const area = stats.intAt(l, cv.CC_STAT_AREA);
      const bw = stats.intAt(l, cv.CC_STAT_WIDTH);
      const bh = stats.intAt(l, cv.CC_STAT_HEIGHT);
      if (area < 0.002 * w * h || Math.max(bw, bh) > 1.5 * Math.min(bw, bh)) continue;
      const fill = area / (bw * bh);
      if (fill < 0.6 || fill > 0.9) continue;
      const bx = stats.intAt(l, cv.CC_STAT_LEFT);
      const by = stats.intAt(l, cv.CC_STAT_TOP);
      found.push({ box: { x: bx * sx, y: by * sy, w: bw * sx, h: bh * sy }, area, cx: (bx + bw / 2) * sx, cy: (by + bh / 2) * sy });
    }
  } finally {
    m.delete();
    labels.delete();
    stats.delete();
    cents.delete();
  }
  const maxA = Math.max(0, ...found.map((c) => c.area));
  const similar = found.filter((c) => c.area >= (opts.minAreaRatio ?? 0.5) * maxA);
  if (similar.length < 2) return [];
  const spread = (v: number[]): number => Math.max(...v) - Math.min(...v);
  const byX = spread(similar.map((c) => c.cx)) >= spread(similar.map((c) => c.cy));
  similar.sort((a, b) => (byX ? a.cx - b.cx || a.cy - b.cy : a.cy - b.cy || a.cx - b.cx));
  return similar.map((c) => c.box);
}

function addTexture(small: Mat, m: Mask, _nBorder: number, w: number, h: number): void {
  const cv = getCv();
  const mean = new cv.Mat();
  const sq = new cv.Mat();
  const mean2 = new cv.Mat();
  try {
    const k = new cv.Size(7, 7);
    cv.boxFilter(small, mean, -1, k, new cv.Point(-1, -1), true, cv.BORDER_REFLECT_101);
    cv.multiply(small, small, sq);
    cv.boxFilter(sq, mean2, -1, k, new cv.Point(-1, -1), true, cv.BORDER_REFLECT_101);
    const a = mean.data32F as Float32Array;
    const b = mean2.data32F as Float32Array;
    const ls = new Float32Array(a.length);
    for (let i = 0; i < a.length; i++) ls[i] = 0.5 * Math.log(Math.max(b[i] - a[i] * a[i], 1e-12));
    const border: number[] = [];
    for (let x = 0; x < w; x++) border.push(ls[x], ls[(h - 1) * w + x]);
    for (let y = 0; y < h; y++) border.push(ls[y * w], ls[y * w + w - 1]);
    const bMed = quantile(border, 0.5);
    const [lsLo, lsHi] = quantiles(ls, [0.001, 0.999]);
    const t = Math.max(otsuThreshold(ls, lsLo, lsHi), bMed + Math.log(3));
    // the intensity step of the edge itself has a high local std: those pixels are re-decided
    // at full resolution later, so adding them here is harmless
    for (let i = 0; i < ls.length; i++) if (ls[i] > t) m.data[i] = 1;
  } finally {
    mean.delete();
    sq.delete();
    mean2.delete();
  }
}

/** Upsample the coarse mask and re-decide pixels near its edge by the intensity threshold. */
function refineAtFullResolution(r: GrayRaster, coarse: Mask, level: number, bright: boolean, band: number): Mask {
  const cv = getCv();
  const W = r.width;
  const H = r.height;
  const c = maskToMat(coarse);
  const up = new cv.Mat();
  const img = rasterToMat(r);
  try {
    if (coarse.width !== W || coarse.height !== H) cv.resize(c, up, new cv.Size(W, H), 0, 0, cv.INTER_LINEAR);
    else c.copyTo(up);
    cv.threshold(up, up, 127, 255, cv.THRESH_BINARY);
    const upData = up.data as Uint8Array;
    const a = rectMorph(upData, W, H, band, 'erode');
    const b = rectMorph(upData, W, H, band, 'dilate');
    cv.GaussianBlur(img, img, new cv.Size(0, 0), 1, 1, cv.BORDER_REFLECT_101);
    const d = img.data32F as Float32Array;
    const out = createMask(W, H);
    for (let i = 0; i < out.data.length; i++) {
      if (a[i]) out.data[i] = 1;
      else if (b[i]) out.data[i] = (d[i] > level) !== bright ? 1 : 0;
    }
    fillHoles(out);
    let sxm = 0;
    let sym = 0;
    let nm = 0;
    for (let i = 0; i < coarse.data.length; i++) {
      if (coarse.data[i]) {
        sxm += i % coarse.width;
        sym += Math.floor(i / coarse.width);
        nm++;
      }
    }
    const target = nm ? { x: ((sxm / nm + 0.5) * W) / coarse.width - 0.5, y: ((sym / nm + 0.5) * H) / coarse.height - 0.5 } : { x: W / 2, y: H / 2 };
    const kept = keepComponent(out, target, 0.25);
    if (!kept) return out;
    fillHoles(kept);
    return kept;
  } finally {
    c.delete();
    up.delete();
    img.delete();
  }
}
