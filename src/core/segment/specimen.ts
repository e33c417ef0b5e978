/**
 * Specimen outline: separate the fracture surface from a dark or bright background, fill holes,
 * keep the specimen component, trace its outer contour and fit a circle and an ellipse.
 */
import { getCv } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createMask, cropRect, pasteRect, type GrayRaster, type Mask } from '../image/raster.js';
import type { BoxPx, PixelBox, PointPx } from '../image/geometry.js';
import { fillHoles, maskToMat, outerContour, rectMorph, setBox } from './cvutil.js';
import { gaussian1 } from './smooth.js';
import { keepComponent, keepLabelled } from './components.js';
import { coarseForeground } from './foreground.js';
import { separatedForeground } from './severalSpecimens.js';
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
 * A clean silhouette: off the frame (< 5 % contact) and well fitted by its ellipse (RMS misfit
 * < max(1.5 px, 1 % of the radius)) — no holder, shadow or noise attached to it.
 */
export function silhouetteIsClean(sil: Specimen): boolean {
  return sil.frameContactFraction < 0.05 && sil.ellipse.rmsResidualPx < Math.max(1.5, 0.01 * sil.circle.radiusPx);
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
  // with a target, touching specimens are cut apart first (severalSpecimens.ts)
  const fg = opts.target ? separatedForeground(r, opts) : coarseForeground(r, opts);
  const { w, h, sx, sy, level, bright } = fg;
  // the component at the image centre, or at the centre of the target box (in coarse px)
  const t = opts.target;
  const aim = t ? { x: (t.x + t.w / 2 + 0.5) / sx - 0.5, y: (t.y + t.h / 2 + 0.5) / sy - 0.5 } : { x: (w - 1) / 2, y: (h - 1) / 2 };
  // a target was vetted as a specimen by listSpecimens: kept whatever the size of other objects
  // (a rule along the frame can be several times larger)
  // the foreground's labelling is shared with listSpecimens (components.ts)
  const kept = keepLabelled(fg.mask, aim, t ? 0 : (opts.minComponentFraction ?? 0.25));
  if (!kept) throw new FractozoneError('NO_SPECIMEN', 'No specimen was found: the image holds no region that differs from the background.');
  const coarse = kept;
  fillHoles(coarse);
  // with a target, the other objects stay out of the re-decided edge band (a touching half)
  let others: Mask | null = null;
  if (t) {
    others = createMask(w, h);
    for (let i = 0; i < others.data.length; i++) others.data[i] = fg.mask.data[i] && !coarse.data[i] ? 1 : 0;
  }
  // band: the texture window (7 px) + smoothing can push the coarse edge ~6 work px outwards
  const mask = refineAtFullResolution(r, coarse, level, bright, Math.ceil(8 * Math.max(sx, sy)) + 2, others);
  const area = countSet(mask.data);
  if (area < 0.002 * W * H) throw new FractozoneError('NO_SPECIMEN', 'No specimen was found: the only regions found are too small.');
  const contour = outerContourInBox(mask);
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

/**
 * `outerContour(mask)` (cvutil.ts) traced on the set pixels' bounding box grown by 1 px (issue 16:
 * the specimen fills about half of the working copy; the mask is copied into OpenCV and scanned
 * whole otherwise). The same points: cv.findContours pads the image it is given with a 1-px
 * border of 0s and scans it row by row, so on a crop whose sides inside the image are 0 it meets
 * the same contours in the same order and follows them pixel for pixel; the points are shifted
 * back by the crop's origin. tests/core/segment/specimenBand.test.ts compares the two.
 */
export function outerContourInBox(mask: Mask): PointPx[] {
  const { width: W, height: H, data } = mask;
  const box = setBox(data, W, H);
  if (!box) return outerContour(mask);
  const x0 = Math.max(0, box.x0 - 1);
  const y0 = Math.max(0, box.y0 - 1);
  const cw = Math.min(W - 1, box.x1 + 1) - x0 + 1;
  const ch = Math.min(H - 1, box.y1 + 1) - y0 + 1;
  if (cw === W && ch === H) return outerContour(mask);
  const crop = createMask(cw, ch, cropRect(data, W, x0, y0, cw, ch, new Uint8Array(cw * ch)));
  return outerContour(crop).map((p) => ({ x: p.x + x0, y: p.y + y0 }));
}

/** Number of set (1) pixels of a 0/1 mask (a loop of its own, issue 16). */
function countSet(d: Uint8Array): number {
  let n = 0;
  for (let i = 0; i < d.length; i++) n += d[i];
  return n;
}

/** A coarse mask at W × H (nearest coarse pixel). */
function upsampleNearest(m: Mask, W: number, H: number): Uint8Array {
  const out = new Uint8Array(W * H);
  for (let y = 0; y < H; y++) {
    const cy = Math.min(m.height - 1, Math.floor(((y + 0.5) * m.height) / H));
    for (let x = 0; x < W; x++) out[y * W + x] = m.data[cy * m.width + Math.min(m.width - 1, Math.floor(((x + 0.5) * m.width) / W))];
  }
  return out;
}

/** Upsample the coarse mask and re-decide pixels near its edge by the intensity threshold. */
function refineAtFullResolution(r: GrayRaster, coarse: Mask, level: number, bright: boolean, band: number, others: Mask | null = null): Mask {
  const cv = getCv();
  const W = r.width;
  const H = r.height;
  const c = maskToMat(coarse);
  const up = new cv.Mat();
  try {
    if (coarse.width !== W || coarse.height !== H) cv.resize(c, up, new cv.Size(W, H), 0, 0, cv.INTER_LINEAR);
    else c.copyTo(up);
    cv.threshold(up, up, 127, 255, cv.THRESH_BINARY);
    const out = createMask(W, H);
    const box = setBox(up.data as Uint8Array, W, H);
    if (box) decideBand(up.data as Uint8Array, W, H, box, band, gaussian1(r), level, bright, others ? upsampleNearest(others, W, H) : null, out.data);
    const target = maskCentroid(coarse, W, H);
    // no fillHoles after keeping one component: `out` has no holes then, and one 8-connected
    // component of it has none either (a removed component is not 8-adjacent to the kept one, so
    // each of its pixels reaches the old background along a row: specimenBand.test.ts checks it)
    return box ? filledKeptInBox(out, grownBox(box, band, W, H), target) : filledKept(out, target);
  } finally {
    c.delete();
    up.delete();
  }
}

/**
 * The edge band's decision: 1 where the square erosion (side 2·band + 1) of `up` is set, the
 * intensity threshold of the smoothed image `d` where only its dilation is (and no other object
 * lies), 0 elsewhere. Both morphologies run on the bounding box of `up` grown by band + 1 px only
 * (≈ half of the working copy for a centred disc, issue 16): every pixel farther from the box is
 * 0 in both, and inside the grown box each pixel sees the same verdict as on the whole image
 * (a window crossing the grown box's edge also holds the 1-px ring of 0s just outside the set
 * pixels' box, as in `morphDisc`; tests/core/segment/specimenBand.test.ts compares the two).
 */
export function decideBand(up: Uint8Array, W: number, H: number, box: PixelBox, band: number, d: Float32Array, level: number, bright: boolean, ou: Uint8Array | null, out: Uint8Array): void {
  const { x0, y0, cw, ch } = grownBox(box, band, W, H);
  const crop = cropRect(up, W, x0, y0, cw, ch, new Uint8Array(cw * ch));
  const a = rectMorph(crop, cw, ch, band, 'erode');
  const b = rectMorph(crop, cw, ch, band, 'dilate');
  for (let y = 0, k = 0; y < ch; y++) {
    for (let x = 0, i = (y0 + y) * W + x0; x < cw; x++, i++, k++) {
      if (a[k]) out[i] = 1;
      else if (b[k] && !(ou && ou[i])) out[i] = (d[i] > level) !== bright ? 1 : 0;
    }
  }
}

/** A box of set pixels grown by band + 1 px on each side and clipped to the W × H image (x0, y0, width, height). */
export interface Crop {
  x0: number;
  y0: number;
  cw: number;
  ch: number;
}

/** The part of the image {@link decideBand} works on: the set pixels' box grown by band + 1 px. */
export function grownBox(box: PixelBox, band: number, W: number, H: number): Crop {
  const g = band + 1;
  const x0 = Math.max(0, box.x0 - g);
  const y0 = Math.max(0, box.y0 - g);
  return { x0, y0, cw: Math.min(W - 1, box.x1 + g) - x0 + 1, ch: Math.min(H - 1, box.y1 + g) - y0 + 1 };
}

/** `fillHoles(m)`, then the component `keepComponent(m, target, 0.25)` keeps (m itself when it is empty). */
function filledKept(m: Mask, target: PointPx): Mask {
  fillHoles(m);
  return keepComponent(m, target, 0.25) ?? m;
}

/**
 * {@link filledKept} of a W × H mask whose set pixels all lie in `c`, worked out on that crop
 * only (issue 16: the crop is about half of a working copy with a centred specimen). Exact:
 * - fillHoles: when the crop's rows and columns along its sides that are not the image's are 0,
 *   a background pixel of the crop reaches the image border in the whole mask exactly when it
 *   reaches the crop's border in the crop (a path out of the crop passes its border pixels, and
 *   everything outside the crop is background connected to the image border), so the holes
 *   filled are the same; otherwise (not the case for `decideBand`'s crop, whose outer ring lies
 *   beyond the dilation) the whole mask is filled;
 * - keepComponent: the components are the same sets; when the target pixel (rounded and clamped
 *   as keepComponent does) lies in the crop and the crop's call keeps the component holding it,
 *   that component was taken for holding the target and being large enough, which the whole
 *   mask's call decides the same way; in any other case (the nearest centroid decides, whose
 *   sums depend on the origin in their last bits) the whole mask is used.
 * `m` may be changed in place. tests/core/segment/specimenBand.test.ts compares with the whole mask.
 */
export function filledKeptInBox(m: Mask, c: Crop, target: PointPx): Mask {
  const { width: W, height: H } = m;
  const { x0, y0, cw, ch } = c;
  const crop = createMask(cw, ch, cropRect(m.data, W, x0, y0, cw, ch, new Uint8Array(cw * ch)));
  if (!openSides(crop.data, cw, ch, x0 > 0, y0 > 0, x0 + cw < W, y0 + ch < H)) return filledKept(m, target);
  fillHoles(crop);
  const tx = Math.min(W - 1, Math.max(0, Math.round(target.x)));
  const ty = Math.min(H - 1, Math.max(0, Math.round(target.y)));
  const inCrop = tx >= x0 && ty >= y0 && tx < x0 + cw && ty < y0 + ch;
  const kept = inCrop ? keepComponent(crop, { x: tx - x0, y: ty - y0 }, 0.25) : null;
  const out = createMask(W, H);
  if (kept && kept.data[(ty - y0) * cw + (tx - x0)]) {
    pasteRect(kept.data, cw, ch, out.data, W, x0, y0);
    return out;
  }
  // the filled crop back in the whole mask, and the component chosen there
  pasteRect(crop.data, cw, ch, out.data, W, x0, y0);
  return keepComponent(out, target, 0.25) ?? out;
}

/** True when the crop's sides that lie inside the image (left, top, right, bottom) hold no set pixel. */
function openSides(d: Uint8Array, cw: number, ch: number, left: boolean, top: boolean, right: boolean, bottom: boolean): boolean {
  for (let x = 0; x < cw; x++) if ((top && d[x]) || (bottom && d[(ch - 1) * cw + x])) return false;
  for (let y = 0; y < ch; y++) if ((left && d[y * cw]) || (right && d[y * cw + cw - 1])) return false;
  return true;
}

/** Centroid of the set pixels of the coarse mask in px of a W × H image (its centre when empty). */
function maskCentroid(coarse: Mask, W: number, H: number): PointPx {
  let sxm = 0;
  let sym = 0;
  let nm = 0;
  const cw = coarse.width;
  // by rows and columns, not i % cw and ⌊i / cw⌋ per pixel (issue 16): the same whole-number sums
  // (exact in any order below 2^53)
  for (let y = 0, i = 0; y < coarse.height; y++) {
    for (let x = 0; x < cw; x++, i++) {
      if (coarse.data[i]) {
        sxm += x;
        sym += y;
        nm++;
      }
    }
  }
  return nm ? { x: ((sxm / nm + 0.5) * W) / cw - 0.5, y: ((sym / nm + 0.5) * H) / coarse.height - 0.5 } : { x: W / 2, y: H / 2 };
}
