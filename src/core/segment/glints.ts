/**
 * Specular glints: small bright specks (light reflected by facets of a slanted, smooth rim) read as
 * strong roughness and pull the smooth band into the rough class. They are found as a white top-hat
 * (the pixel minus a grey opening with a 7 × 7 square) far above its spread over the specimen, and
 * replaced by the opening (the surrounding surface without the speck). Where there are (almost) no
 * such specks the image is returned as it is, so an image without glints is measured exactly as
 * before. The replaced pixels are also returned as a mask: on a densely sparkling rim the opening
 * still carries the specks' remains (blocks of clustered specks, faint ones between them), so the
 * boundary refinement leaves those pixels out instead of reading them as texture (segment/refine.ts
 * `missing`).
 */
import type { PixelBox } from '../image/geometry.js';
import { createRaster, cropRect, pasteRect, type GrayRaster, type Mask } from '../image/raster.js';
import { rectMorph, setBox } from './cvutil.js';
import { quantiles } from './quantiles.js';

/** Radius of the opening, working px (specks narrower than 7 px are removed). */
const OPEN_RADIUS = 3;
/**
 * A speck stands out of the opening by more than max(GLINT_MIN_STEP, median + GLINT_SIGMAS robust σ)
 * of the top-hat over the specimen (our choice, measured on rendered scenes: rims with glints
 * 0.4–1.5 % of the specimen above it, noisy, SEM, JPEG and plain scenes and the bundled samples 0).
 */
const GLINT_MIN_STEP = 0.15;
const GLINT_SIGMAS = 8;
/** Share of the specimen above which the specks are suppressed (below it nothing changes). */
const GLINT_MIN_FRACTION = 0.001;

/**
 * Within NEAR_RADIUS working px of a speck, fainter specks (above max(GLINT_NEAR_MIN_STEP, median +
 * GLINT_NEAR_SIGMAS σ)) go too. 1.5 σ, not 3 (measured on the scene set's four glint scenes with the
 * masked refinement: mean width error glints-b −4.7 % → −1.4 %, large-combo −8.8 % → −2.6 %; 2 σ gave
 * −1.8 % and −3.0 %): the glints' fainter halos read as core texture otherwise.
 */
const NEAR_RADIUS = 6;
const GLINT_NEAR_MIN_STEP = 0.05;
const GLINT_NEAR_SIGMAS = 1.5;
/** The mask of replaced pixels is grown by this many px (bilinear samples next to a replaced pixel carry part of it). */
const MASK_GROW = 1;

/**
 * The grey opening is four running extrema over 2r + 1 samples (erosion along rows, then columns,
 * then dilation the same way), each by doubling: on a line padded with r samples of ±∞ at both ends
 * (samples outside the image are ignored, as OpenCV's erode/dilate borders), p[i] ← min(p[i], p[i + s])
 * for s = 1, 2, 4, … makes p[i] the extremum of p[i … i + 2s − 1]; with S the largest such span ≤ 2r + 1,
 * the window [i, i + 2r] is the union of [i, i + S) and [i + 2r + 1 − S, i + 2r]. For r = 3: three
 * comparisons per sample and pass, like van Herk / Gil–Werman, but without its block prefix and
 * suffix arrays, and the columns are done on whole rows at a time in one padded buffer (contiguous
 * access, no column copies). Min and max only select input values, so the result is exact; it equals
 * the former van Herk form (erosion of −x for the dilation) on inputs without −0 (a decoded image
 * has none) and OpenCV's MORPH_OPEN with MORPH_RECT (tests/core/segment/glints.test.ts).
 */

/** Largest power of two ≤ k. */
function spanOf(k: number): number {
  let s = 1;
  while (2 * s <= k) s *= 2;
  return s;
}

/** Running min (max when `max`) over 2r + 1 samples of every row of src (w × h) into dst from dOff on; `line` holds w + 2r values. */
function extremumRows(src: Float32Array, dst: Float32Array, dOff: number, w: number, h: number, r: number, max: boolean, line: Float32Array): void {
  const pad = max ? -Infinity : Infinity;
  const k = 2 * r + 1;
  const S = spanOf(k);
  const len = w + 2 * r;
  for (let y = 0; y < h; y++) {
    // the doubling overwrites the leading padding: set again for each row
    for (let i = 0; i < r; i++) {
      line[i] = pad;
      line[w + r + i] = pad;
    }
    line.set(src.subarray(y * w, y * w + w), r);
    if (max) maxLine(line, len, S, k, dst, dOff + y * w, w);
    else minLine(line, len, S, k, dst, dOff + y * w, w);
  }
}

/** Doubling running minimum of one padded line (see above) into dst[off … off + n). */
function minLine(p: Float32Array, len: number, S: number, k: number, dst: Float32Array, off: number, n: number): void {
  for (let s = 1; s < S; s *= 2) {
    for (let i = 0, e = len - s; i < e; i++) {
      const a = p[i];
      const b = p[i + s];
      p[i] = b < a ? b : a;
    }
  }
  const d = k - S;
  for (let x = 0; x < n; x++) {
    const a = p[x];
    const b = p[x + d];
    dst[off + x] = b < a ? b : a;
  }
}

/** {@link minLine} with the maximum. */
function maxLine(p: Float32Array, len: number, S: number, k: number, dst: Float32Array, off: number, n: number): void {
  for (let s = 1; s < S; s *= 2) {
    for (let i = 0, e = len - s; i < e; i++) {
      const a = p[i];
      const b = p[i + s];
      p[i] = b > a ? b : a;
    }
  }
  const d = k - S;
  for (let x = 0; x < n; x++) {
    const a = p[x];
    const b = p[x + d];
    dst[off + x] = b > a ? b : a;
  }
}

/** dst[dOff + x] = min (max when `max`) of a[aOff + x] and b[bOff + x], x < w. */
function pairRows(dst: Float32Array, dOff: number, a: Float32Array, aOff: number, b: Float32Array, bOff: number, w: number, max: boolean): void {
  if (max) {
    for (let x = 0; x < w; x++) {
      const u = a[aOff + x];
      const v = b[bOff + x];
      dst[dOff + x] = v > u ? v : u;
    }
  } else {
    for (let x = 0; x < w; x++) {
      const u = a[aOff + x];
      const v = b[bOff + x];
      dst[dOff + x] = v < u ? v : u;
    }
  }
}

/**
 * Running min (max) over 2r + 1 rows of the h rows held in `P` ((h + 2r) × w, the rows from row r
 * on; the r rows at either end are set to ±∞ here), doubled in place a whole row at a time; the
 * result goes to dst (w × h).
 */
function extremumColumns(P: Float32Array, dst: Float32Array, w: number, h: number, r: number, max: boolean): void {
  const k = 2 * r + 1;
  const S = spanOf(k);
  const len = h + 2 * r;
  P.fill(max ? -Infinity : Infinity, 0, r * w);
  P.fill(max ? -Infinity : Infinity, (h + r) * w, len * w);
  for (let s = 1; s < S; s *= 2) {
    for (let i = 0, e = len - s; i < e; i++) pairRows(P, i * w, P, i * w, P, (i + s) * w, w, max);
  }
  const d = k - S;
  for (let y = 0; y < h; y++) pairRows(dst, y * w, P, y * w, P, (y + d) * w, w, max);
}

/** Grey opening with a (2r + 1)² square (equal to OpenCV's MORPH_OPEN with MORPH_RECT; tested against it). */
export function openRect(r: GrayRaster, radius: number): Float32Array {
  const { width: w, height: h } = r;
  const out = new Float32Array(w * h);
  const P = new Float32Array((h + 2 * radius) * w);
  const line = new Float32Array(w + 2 * radius);
  // the row pass writes into P's inner rows, the column pass reads them there (erosion into `out`, then the dilation of it)
  extremumRows(r.data, P, radius * w, w, h, radius, false, line);
  extremumColumns(P, out, w, h, radius, false);
  extremumRows(out, P, radius * w, w, h, radius, true, line);
  extremumColumns(P, out, w, h, radius, true);
  return out;
}

/**
 * {@link openRect} where {@link suppressGlints} reads it: on the specimen's bounding box grown by one
 * px (the specks are marked one px wider), elsewhere 0. The opening at a pixel is a minimum and
 * maximum over the pixels within 2·radius, so the box is opened with 2·radius px more around it
 * (or up to the frame) and the values read are those of the whole image's opening; on the 12-MP
 * bench (specimen ≈ ½ of the working copy) it halves the stage's ≈ 0.1 s (CPU profile).
 */
function openNearMask(r: GrayRaster, b: PixelBox, radius: number): Float32Array {
  const W = r.width;
  const H = r.height;
  const g = 1 + 2 * radius;
  const x0 = Math.max(0, b.x0 - g);
  const y0 = Math.max(0, b.y0 - g);
  const x1 = Math.min(W - 1, b.x1 + g);
  const y1 = Math.min(H - 1, b.y1 + g);
  const w = x1 - x0 + 1;
  const h = y1 - y0 + 1;
  if (w === W && h === H) return openRect(r, radius);
  const oc = openRect(createRaster(w, h, cropRect(r.data, W, x0, y0, w, h, new Float32Array(w * h))), radius);
  const out = new Float32Array(W * H);
  pasteRect(oc, w, h, out, W, x0, y0);
  return out;
}

/** Result of {@link suppressGlints}. */
export interface GlintSuppression {
  /** The raster with the specks replaced (the input itself when none were). */
  raster: GrayRaster;
  /** Share of the specimen's pixels replaced (0 when none). */
  fraction: number;
  /**
   * The replaced pixels grown by {@link MASK_GROW} px, inside the specimen (1), at the raster's size:
   * their texture is unknown. Null when nothing was replaced.
   */
  mask: Uint8Array | null;
}

/**
 * Marks the specks (top-hat above t inside the mask), one pixel wider; returns the count inside the
 * mask. Only the mask's bounding box `b` is visited: outside it the mask is 0, so nothing is marked
 * from there or counted there. The specks are listed first by a loop without branches and marked
 * afterwards: with the marking inside the scan, V8 optimised the scan before the first speck and
 * fell back to the interpreter at it (an image without glints still has a few specks).
 */
function markSpecks(v: Float32Array, o: Float32Array, mask: Uint8Array, t: number, w: number, h: number, b: PixelBox, out: Uint8Array): number {
  const list = new Int32Array((b.x1 - b.x0 + 1) * (b.y1 - b.y0 + 1) + 1);
  const nList = listAbove(v, o, mask, t, w, b, list);
  for (let k = 0; k < nList; k++) {
    const i = list[k];
    const y = (i / w) | 0;
    const x = i - y * w;
    for (let dy = -1; dy <= 1; dy++) {
      const yy = y + dy;
      if (yy < 0 || yy >= h) continue;
      for (let dx = -1; dx <= 1; dx++) {
        const xx = x + dx;
        if (xx >= 0 && xx < w) out[yy * w + xx] = 1;
      }
    }
  }
  return countBoth(out, mask, w, b);
}

/** The indices (row-major) of the mask pixels of the box whose top-hat v − o is not ≤ t, into list; their number. */
function listAbove(v: Float32Array, o: Float32Array, mask: Uint8Array, t: number, w: number, b: PixelBox, list: Int32Array): number {
  let n = 0;
  const { x0, y0, x1, y1 } = b;
  for (let y = y0; y <= y1; y++) {
    for (let i = y * w + x0, e = y * w + x1; i <= e; i++) {
      list[n] = i;
      n += (mask[i] !== 0 ? 1 : 0) & (v[i] - o[i] <= t ? 0 : 1); // as "not ≤ t" (NaN counts, as before)
    }
  }
  return n;
}

/** Pixels of the box set in both a and mask. */
function countBoth(a: Uint8Array, mask: Uint8Array, w: number, b: PixelBox): number {
  let n = 0;
  const { x0, y0, x1, y1 } = b;
  for (let y = y0; y <= y1; y++) for (let i = y * w + x0, e = y * w + x1; i <= e; i++) n += a[i] !== 0 && mask[i] !== 0 ? 1 : 0;
  return n;
}

/** Number of set mask pixels (all inside the box `b`). */
function countInBox(mask: Uint8Array, w: number, b: PixelBox): number {
  let n = 0;
  for (let y = b.y0; y <= b.y1; y++) for (let i = y * w + b.x0, e = y * w + b.x1; i <= e; i++) if (mask[i]) n++;
  return n;
}

/** th[k] = v − o at the k-th set mask pixel in row-major order (all inside the box `b`). */
function topHatInBox(v: Float32Array, o: Float32Array, mask: Uint8Array, w: number, b: PixelBox, th: Float32Array): void {
  let k = 0;
  for (let y = b.y0; y <= b.y1; y++) for (let i = y * w + b.x0, e = y * w + b.x1; i <= e; i++) if (mask[i]) th[k++] = v[i] - o[i];
}

/**
 * Replaces glints on the specimen by the grey opening of the image.
 *
 * @param r - working copy, gray 0..1
 * @param mask - the specimen mask at the same size
 */
export function suppressGlints(r: GrayRaster, mask: Mask): GlintSuppression {
  {
    // the mask's bounding box: the opening, the top-hat and the specks are only looked at there
    const box = setBox(mask.data, r.width, r.height);
    const nMask = box ? countInBox(mask.data, r.width, box) : 0;
    if (!box || nMask < 100) return { raster: r, fraction: 0, mask: null };
    const o = openNearMask(r, box, OPEN_RADIUS);
    const v = r.data;
    const th = new Float32Array(nMask);
    topHatInBox(v, o, mask.data, r.width, box, th);
    const [med, q25, q75] = quantiles(th, [0.5, 0.25, 0.75]);
    const t = Math.max(GLINT_MIN_STEP, med + (GLINT_SIGMAS * (q75 - q25)) / 1.349);
    const specks = new Uint8Array(v.length);
    const n = markSpecks(v, o, mask.data, t, r.width, r.height, box, specks);
    const fraction = n / nMask;
    if (fraction < GLINT_MIN_FRACTION) return { raster: r, fraction: 0, mask: null };
    // around the specks found, the fainter ones too (a glinting crescent has many below the first threshold)
    const near = rectMorph(specks, r.width, r.height, NEAR_RADIUS, 'dilate');
    const tNear = Math.max(GLINT_NEAR_MIN_STEP, med + (GLINT_NEAR_SIGMAS * (q75 - q25)) / 1.349);
    const out = Float32Array.from(v);
    const replaced = new Uint8Array(v.length);
    for (let i = 0; i < out.length; i++) {
      if (specks[i] || (near[i] && mask.data[i] && v[i] - o[i] > tNear)) {
        out[i] = o[i];
        replaced[i] = 1;
      }
    }
    const grown = rectMorph(replaced, r.width, r.height, MASK_GROW, 'dilate');
    for (let i = 0; i < grown.length; i++) if (!mask.data[i]) grown[i] = 0;
    return { raster: createRaster(r.width, r.height, out), fraction, mask: grown };
  }
}
