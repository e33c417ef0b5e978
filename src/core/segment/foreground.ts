/**
 * The coarse foreground of a fractograph (steps 1–4 of `findSpecimen`, segment/specimen.ts): every
 * region that differs from the background, on a grid of at most `workSizePx`, computed once per
 * raster and options.
 */
import { oncePerRaster } from './memo.js';
import { getCv, type Mat } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createMask, type GrayRaster, type Mask } from '../image/raster.js';
import { fillHoles, maskToMat, matToMask, morphDisc, otsuThreshold, rasterToMat } from './cvutil.js';
import { quantile, quantiles } from './quantiles.js';

/** Options of {@link coarseForeground} (the same fields of SpecimenOptions). */
export interface ForegroundOptions {
  /** Longest side of the working image for the coarse segmentation (default 1024 px). */
  workSizePx?: number;
  /** Use local texture as well as intensity to find the surface (default true). */
  useTexture?: boolean;
}

/** The coarse foreground of `findSpecimen`: every region that differs from the background. */
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
 * Steps (1)–(4) of `findSpecimen`: the foreground of every object on a coarse grid (computed
 * once per raster and options; do not write to the returned mask).
 * @throws FractozoneError NO_SPECIMEN when the image is too small or has no contrast
 */
export function coarseForeground(r: GrayRaster, opts: ForegroundOptions = {}): CoarseForeground {
  return oncePerRaster(FOREGROUNDS, r, foregroundKey(opts), () => computeForeground(r, opts));
}

/** The cache key of the foreground options. */
export function foregroundKey(opts: ForegroundOptions): string {
  return `${opts.workSizePx ?? 1024}|${opts.useTexture ?? true}`;
}

function computeForeground(r: GrayRaster, opts: ForegroundOptions): CoarseForeground {
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
    thresholdInto(sd, level, bright, m.data);
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
    const ls = logStd(a, b);
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

/** 1 where the smoothed intensity lies on the surface's side of `level` (loops of their own: issue 16, see logRoughness in polar.ts). */
function thresholdInto(sd: Float32Array, level: number, bright: boolean, out: Uint8Array): void {
  for (let i = 0; i < sd.length; i++) out[i] = (sd[i] > level) !== bright ? 1 : 0;
}

/** ln of the local standard deviation from the box means of x and x² (variance floored at 1e-12). */
function logStd(a: Float32Array, b: Float32Array): Float32Array {
  const ls = new Float32Array(a.length);
  for (let i = 0; i < a.length; i++) ls[i] = 0.5 * Math.log(Math.max(b[i] - a[i] * a[i], 1e-12));
  return ls;
}
