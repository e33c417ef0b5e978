/**
 * Automatic scale-bar detection.
 *
 * A scale bar is a long, thin, uniform, high-contrast, axis-aligned rectangle, usually in a margin or
 * corner, often on a plate and with a text label. Detection runs in two stages:
 *
 * 1. **Search at reduced resolution.** The image is reduced by an integer factor f (so that about
 *    `workPixels` remain) with *max* pooling (keeps thin light bars at full contrast) and *min* pooling
 *    (keeps thin dark bars). Each pooled image is binarised by local contrast (pixel minus its box mean
 *    over a window ≥ 4× the largest bar thickness, against a threshold tied to the image's 1–99 %
 *    intensity range), and connected components (OpenCV `connectedComponentsWithStats`) that are long,
 *    thin and of near-constant thickness along their length become candidates.
 * 2. **Refinement at full resolution**, only around each candidate: the across-bar profile (per-row
 *    median over many columns, which ignores label text) gives the two long edges by their 50 % crossings,
 *    hence thickness and midline; per-column edge positions give straightness; interior and surrounding
 *    strips give uniformity and contrast on both sides; the along-bar profile on the midline rows gives
 *    each end as the 50 % crossing between the bar level and the surrounding level (linear interpolation
 *    between pixel centres), hence `lengthPx` edge to edge.
 *
 * End caps / ticks (|———|): the caps are part of the bar on its midline, so the measured length runs
 * between the *outer* edges of the caps — the usual convention for capped bars. Caps do not disturb
 * thickness or straightness because those use the central 60 % of the length only (ends excluded).
 *
 * Rejected: features whose end reaches the image frame (the length cannot be measured), features with
 * contrast on one side only (a specimen edge, the border of a data strip), ragged edges or non-uniform
 * interior (ridges, cracks, texture). A confidence in 0..1 is the product of contrast, two-sidedness,
 * straightness, uniformity, surroundings, end sharpness, position and label factors; below
 * `minConfidence` (default {@link DEFAULT_MIN_CONFIDENCE}) the detector returns `null` — it never guesses.
 *
 * The 50 % crossing is the standard edge locator for a blurred step (the half-maximum point of the edge
 * spread function); see e.g. ISO 12233 (edge-based resolution measurement) for edge profiles, and
 * Gonzalez & Woods, *Digital Image Processing*, ch. 10 (thresholding, edges).
 */
import { getCv } from '../cv.js';
import type { GrayRaster } from '../image/raster.js';
import { FractozoneError } from '../errors.js';
import type { BoxPx } from '../image/geometry.js';


/** A detected scale bar. Coordinates are image coordinates (pixel centres at integer x, y). */
export interface ScaleBar {
  /** Midline end points, px: the centres of the first and last bar pixels (sub-pixel). */
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  /** Edge-to-edge length along the bar, px (= x1 − x0 + 1 for a horizontal bar). */
  lengthPx: number;
  /** Edge-to-edge thickness across the bar, px. */
  thicknessPx: number;
  orientation: 'horizontal' | 'vertical';
  /** 'light' = bar brighter than its surroundings. */
  polarity: 'light' | 'dark';
  /** 0..1; bars below the detector's threshold are not returned. */
  confidence: number;
  /** Contrasting plate behind bar and label, when one is found. */
  plate?: BoxPx;
  /** Union box of text-like marks next to the bar, when found. */
  labelBox?: BoxPx;
}

/** Options of {@link detectScaleBar}. */
export interface ScaleBarOptions {
  /** Confidence below which `null` is returned (default 0.5). */
  minConfidence?: number;
  /** Thinnest bar searched, px (default 2). */
  minThicknessPx?: number;
  /** Thickest bar searched, px (default 40). */
  maxThicknessPx?: number;
  /** Shortest bar as a fraction of the image extent along the bar (default 0.03). */
  minLengthFraction?: number;
  /** Pixel budget of the reduced search image (default 1.2e6). */
  workPixels?: number;
}

/** Default confidence threshold: candidates scoring below it are not reported. */
export const DEFAULT_MIN_CONFIDENCE = 0.5;

const clamp01 = (v: number): number => (v <= 0 ? 0 : v >= 1 ? 1 : Number.isFinite(v) ? v : 0);

/**
 * Find the scale bar burned into an image, or return `null` when there is none (never a guess).
 * @param raster gray image, values 0..1.
 * @param options search limits; thickness and length in px of the full-resolution image.
 * @returns the best bar with confidence ≥ `minConfidence`, else `null`.
 * @throws FractozoneError BAD_PARAMETER for inconsistent options.
 */
export function detectScaleBar(raster: GrayRaster, options: ScaleBarOptions = {}): ScaleBar | null {
  const minConfidence = options.minConfidence ?? DEFAULT_MIN_CONFIDENCE;
  const minT = options.minThicknessPx ?? 2;
  const maxT = options.maxThicknessPx ?? 40;
  const minLenFrac = options.minLengthFraction ?? 0.03;
  const workPixels = options.workPixels ?? 1.2e6;
  if (!(minT > 0) || !(maxT >= minT) || !(minLenFrac > 0 && minLenFrac < 1) || !(workPixels >= 1e4) || !(minConfidence >= 0 && minConfidence <= 1)) {
    throw new FractozoneError('BAD_PARAMETER', 'scale-bar search options are inconsistent (need 0 < min thickness ≤ max thickness, 0 < length fraction < 1)');
  }
  const { width: W, height: H } = raster;
  if (W < 24 || H < 24) return null;

  const f = Math.max(1, Math.ceil(Math.sqrt((W * H) / workPixels)));
  const { maxImg, minImg, w, h } = _pool(raster, f, Math.max(1, Math.min(f, Math.floor(minT))));
  // threshold tied to the 1–99 % range; a plain image holding only a bar has a tiny range, so the
  // absolute floor (0.05) then applies; nothing to find when the extremes are that close
  const { range, spread } = _ranges(maxImg, minImg);
  if (spread < 0.05) return null;
  const delta = Math.max(0.05, 0.3 * range);
  const maxTW = Math.ceil(maxT / f);
  let win = 2 * maxTW + 1;
  win = Math.max(15, win | 1);

  const ctx: Ctx = { raster, f, w, h, minT, maxT, minLenFrac, maxTW };
  let best: ScaleBar | null = null;
  for (const polarity of ['light', 'dark'] as const) {
    const img = polarity === 'light' ? maxImg : minImg;
    const { labels, stats, n } = _binariseAndLabel(img, w, h, win, delta, polarity);
    const cands = _candidates(ctx, labels, stats, n);
    for (const c of cands) {
      const bar = _refine(ctx, c, polarity, labels, stats, n);
      if (bar && (!best || bar.confidence > best.confidence)) best = bar;
    }
  }
  return best && best.confidence >= minConfidence ? best : null;
}

interface Ctx {
  raster: GrayRaster;
  f: number;
  w: number;
  h: number;
  minT: number;
  maxT: number;
  minLenFrac: number;
  maxTW: number;
}

interface Candidate {
  id: number;
  orientation: 'horizontal' | 'vertical';
  /** Work-resolution bbox. */
  left: number;
  top: number;
  bw: number;
  bh: number;
  /** Median thickness, work px; median start of the bar across (work px). */
  tW: number;
  acrossStart: number;
}

/**
 * Max- and min-pool by an integer factor (remainder rows/columns dropped), reading every `stride`-th
 * row and column of each block: a bar at least `stride` px thick is always sampled.
 */
function _pool(r: GrayRaster, f: number, stride: number): { maxImg: Float32Array; minImg: Float32Array; w: number; h: number } {
  const w = Math.floor(r.width / f);
  const h = Math.floor(r.height / f);
  if (f === 1) return { maxImg: r.data, minImg: r.data, w, h };
  const maxImg = new Float32Array(w * h);
  const minImg = new Float32Array(w * h);
  const d = r.data;
  const W = r.width;
  for (let Y = 0; Y < h; Y++) {
    const base = Y * f * W;
    for (let X = 0; X < w; X++) {
      let i0 = base + X * f;
      let mx = d[i0];
      let mn = mx;
      for (let k = 0; k < f; k += stride, i0 += stride * W) {
        for (let x = i0, e = i0 + f; x < e; x += stride) {
          const v = d[x];
          if (v > mx) mx = v;
          else if (v < mn) mn = v;
        }
      }
      maxImg[Y * w + X] = mx;
      minImg[Y * w + X] = mn;
    }
  }
  return { maxImg, minImg, w, h };
}

/**
 * From 256-bin histograms: the 1–99 % range (p99 of the max-pooled image minus p1 of the min-pooled
 * image) and the full spread (highest minus lowest occupied bin).
 */
function _ranges(maxImg: Float32Array, minImg: Float32Array): { range: number; spread: number } {
  const hist = (a: Float32Array): Uint32Array => {
    const hh = new Uint32Array(256);
    for (let i = 0; i < a.length; i++) {
      const v = a[i];
      hh[v <= 0 ? 0 : v >= 1 ? 255 : (v * 255) | 0]++;
    }
    return hh;
  };
  const pct = (hh: Uint32Array, q: number): number => {
    const target = q * maxImg.length;
    let acc = 0;
    for (let b = 0; b < 256; b++) {
      acc += hh[b];
      if (acc >= target) return b / 255;
    }
    return 1;
  };
  const hMax = hist(maxImg);
  const hMin = maxImg === minImg ? hMax : hist(minImg);
  let hi = 255;
  while (hi > 0 && hMax[hi] === 0) hi--;
  let lo = 0;
  while (lo < 255 && hMin[lo] === 0) lo++;
  return { range: pct(hMax, 0.99) - pct(hMin, 0.01), spread: (hi - lo) / 255 };
}

function _binariseAndLabel(
  img: Float32Array,
  w: number,
  h: number,
  win: number,
  delta: number,
  polarity: 'light' | 'dark',
): { labels: Int32Array; stats: Int32Array; n: number } {
  const cv = getCv();
  const src = cv.matFromArray(h, w, cv.CV_32F, img);
  const mean = new cv.Mat();
  const bin = new cv.Mat(h, w, cv.CV_8U);
  const lab = new cv.Mat();
  const st = new cv.Mat();
  const cen = new cv.Mat();
  try {
    cv.blur(src, mean, new cv.Size(win, win), new cv.Point(-1, -1), cv.BORDER_REPLICATE);
    const m = mean.data32F as Float32Array;
    const b = bin.data as Uint8Array;
    if (polarity === 'light') for (let i = 0; i < b.length; i++) b[i] = img[i] - m[i] > delta ? 1 : 0;
    else for (let i = 0; i < b.length; i++) b[i] = m[i] - img[i] > delta ? 1 : 0;
    const n = cv.connectedComponentsWithStats(bin, lab, st, cen, 4, cv.CV_32S) as number;
    return { labels: new Int32Array(lab.data32S), stats: new Int32Array(st.data32S), n };
  } finally {
    src.delete();
    mean.delete();
    bin.delete();
    lab.delete();
    st.delete();
    cen.delete();
  }
}

const ST_LEFT = 0;
const ST_TOP = 1;
const ST_W = 2;
const ST_H = 3;
const ST_AREA = 4;

/** Long, thin, constant-thickness components at work resolution. */
function _candidates(ctx: Ctx, labels: Int32Array, stats: Int32Array, n: number): Candidate[] {
  const { w, h, maxTW, f, minLenFrac } = ctx;
  const out: (Candidate & { area: number })[] = [];
  for (let id = 1; id < n; id++) {
    const left = stats[id * 5 + ST_LEFT];
    const top = stats[id * 5 + ST_TOP];
    const bw = stats[id * 5 + ST_W];
    const bh = stats[id * 5 + ST_H];
    const area = stats[id * 5 + ST_AREA];
    const horizontal = bw >= bh;
    const long = horizontal ? bw : bh;
    const short = horizontal ? bh : bw;
    const minLenW = Math.max(6, Math.floor((minLenFrac * (horizontal ? w : h)) / 1));
    if (long < minLenW || long < 3 * short || short > 4 * maxTW + 4) continue;
    if (area < 0.5 * long) continue;
    // ends must not reach the frame: the length could not be measured
    if (horizontal ? left <= 0 || left + bw >= w : top <= 0 || top + bh >= h) continue;
    // the bar band: rows (across positions) covered over most of the length; labels, caps and
    // merged neighbours cover only part of it
    const counts = new Int32Array(short);
    for (let yy = 0; yy < bh; yy++) {
      const row = (top + yy) * w + left;
      for (let xx = 0; xx < bw; xx++) if (labels[row + xx] === id) counts[horizontal ? yy : xx]++;
    }
    let r0 = -1;
    let r1 = -2;
    for (let k = 0; k < short; k++) {
      if (counts[k] < 0.6 * long) continue;
      let e = k;
      while (e + 1 < short && counts[e + 1] >= 0.6 * long) e++;
      if (e - k > r1 - r0) (r0 = k), (r1 = e);
      k = e;
    }
    const tW = r1 - r0 + 1;
    if (tW < 1 || tW > maxTW + 2) continue;
    // columns that hold the whole band
    // (partly covered edge rows may be on in some columns only: allow two rows short)
    let full = 0;
    const need = Math.max(1, tW - 2);
    for (let u = 0; u < long; u++) {
      let on = 0;
      for (let v = r0; v <= r1; v++) {
        const x = horizontal ? left + u : left + v;
        const y = horizontal ? top + v : top + u;
        if (labels[y * w + x] === id) on++;
      }
      if (on >= need) full++;
    }
    if (full < 0.8 * long || long < 6 * tW) continue;
    const acrossStart = r0 + (horizontal ? top : left);
    out.push({ id, orientation: horizontal ? 'horizontal' : 'vertical', left, top, bw, bh, tW, acrossStart, area });
  }
  out.sort((a, b) => b.area - a.area);
  return out.slice(0, 40);
}

function _median(a: number[]): number {
  if (a.length === 0) return NaN;
  const s = a.slice().sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Robust standard deviation (1.4826 × median absolute deviation). */
function _robustStd(a: number[]): number {
  if (a.length < 2) return 0;
  const m = _median(a);
  return 1.4826 * _median(a.map((v) => Math.abs(v - m)));
}

/**
 * Position where the profile crosses `level`, walking from index `start` (inside, value on the `sign`
 * side of level) in direction `dir` (±1). Linear interpolation between samples. NaN if never crossed.
 */
function _crossing(p: Float64Array, start: number, dir: 1 | -1, level: number, sign: number): number {
  let i = start;
  if (i < 0 || i >= p.length || (p[i] - level) * sign <= 0) return NaN;
  for (;;) {
    const j = i + dir;
    if (j < 0 || j >= p.length) return NaN;
    if ((p[j] - level) * sign <= 0) {
      const a = p[i];
      const b = p[j];
      const t = a === b ? 0.5 : (a - level) / (a - b);
      return i + dir * t;
    }
    i = j;
  }
}

function _refine(
  ctx: Ctx,
  c: Candidate,
  polarity: 'light' | 'dark',
  labels: Int32Array,
  stats: Int32Array,
  n: number,
): ScaleBar | null {
  const { raster, f, minT, maxT } = ctx;
  const W = raster.width;
  const H = raster.height;
  const d = raster.data;
  const horiz = c.orientation === 'horizontal';
  const Lu = horiz ? W : H; // extent along
  const Lv = horiz ? H : W; // extent across
  const get = horiz ? (u: number, v: number) => d[v * W + u] : (u: number, v: number) => d[u * W + v];
  const sign = polarity === 'light' ? 1 : -1;

  const uA = (horiz ? c.left : c.top) * f;
  const uB = ((horiz ? c.left + c.bw : c.top + c.bh) * f) - 1;
  const lenC = uB - uA + 1;
  const tC = c.tW * f;
  const vc = (c.acrossStart + c.tW / 2) * f;
  // --- across profile (per-row median over the central 60 % of the length) ---
  const s = Math.max(3, Math.ceil(Math.min(tC, maxT) / 2));
  const gap = 2;
  const R = Math.ceil(tC / 2 + f + gap + s + 3);
  const v0 = Math.max(0, Math.floor(vc - R));
  const v1 = Math.min(Lv - 1, Math.ceil(vc + R));
  const cu0 = Math.round(uA + 0.2 * lenC);
  const cu1 = Math.round(uB - 0.2 * lenC);
  const step = Math.max(1, Math.floor((cu1 - cu0 + 1) / 160));
  const cols: number[] = [];
  for (let u = cu0; u <= cu1; u += step) cols.push(u);
  if (cols.length < 3) return null;
  const nv = v1 - v0 + 1;
  const prof = new Float64Array(nv);
  const tmp: number[] = new Array(cols.length);
  for (let k = 0; k < nv; k++) {
    for (let j = 0; j < cols.length; j++) tmp[j] = get(cols[j], v0 + k);
    prof[k] = _median(tmp);
  }
  // peak (bar level) near the coarse centre
  const pk0 = Math.max(0, Math.floor(vc - tC / 2 - f - v0));
  const pk1 = Math.min(nv - 1, Math.ceil(vc + tC / 2 + f - v0));
  let peak = pk0;
  for (let k = pk0; k <= pk1; k++) if ((prof[k] - prof[peak]) * sign > 0) peak = k;
  const inLevel = prof[peak];
  let outA = prof[0];
  let outB = prof[nv - 1];
  let top = NaN;
  let bot = NaN;
  for (let iter = 0; iter < 2; iter++) {
    top = _crossing(prof, peak, -1, (inLevel + outA) / 2, sign);
    bot = _crossing(prof, peak, 1, (inLevel + outB) / 2, sign);
    if (!Number.isFinite(top) || !Number.isFinite(bot)) return null;
    const stripA: number[] = [];
    const stripB: number[] = [];
    for (let k = Math.floor(top - gap - s); k <= Math.floor(top - gap); k++) if (k >= 0) stripA.push(prof[k]);
    for (let k = Math.ceil(bot + gap); k <= Math.ceil(bot + gap + s); k++) if (k < nv) stripB.push(prof[k]);
    if (stripA.length === 0 || stripB.length === 0) return null; // touches the frame across
    outA = _median(stripA);
    outB = _median(stripB);
  }
  const thickness = bot - top;
  if (thickness < Math.min(1.5, minT) || thickness > maxT + 1) return null;
  const cA = sign * (inLevel - outA);
  const cB = sign * (inLevel - outB);
  if (!(cA > 0) || !(cB > 0)) return null;
  const contrast = Math.min(cA, cB);
  const topAbs = top + v0;
  const botAbs = bot + v0;
  const mid = (topAbs + botAbs) / 2;

  // --- per-column edges, interior and surroundings over the central 60 % ---
  const tops: number[] = [];
  const bots: number[] = [];
  const inner: number[] = [];
  const surA: number[] = [];
  const surB: number[] = [];
  const cv0 = Math.max(0, Math.floor(topAbs - gap - s));
  const cv1 = Math.min(Lv - 1, Math.ceil(botAbs + gap + s));
  const colProf = new Float64Array(cv1 - cv0 + 1);
  const inRows: number[] = [];
  for (let v = Math.ceil(topAbs + 0.5); v <= Math.floor(botAbs - 0.5); v++) inRows.push(v);
  if (inRows.length === 0) inRows.push(Math.round(mid));
  const pkc = Math.round(mid) - cv0;
  const levelA = (inLevel + outA) / 2;
  const levelB = (inLevel + outB) / 2;
  for (const u of cols) {
    for (let v = cv0; v <= cv1; v++) colProf[v - cv0] = get(u, v);
    tops.push(_crossing(colProf, pkc, -1, levelA, sign) + cv0);
    bots.push(_crossing(colProf, pkc, 1, levelB, sign) + cv0);
    let m = 0;
    for (const v of inRows) m += get(u, v);
    inner.push(m / inRows.length);
    let a = 0;
    let na = 0;
    for (let v = Math.floor(topAbs - gap - s); v <= Math.floor(topAbs - gap); v++) if (v >= 0) (a += get(u, v)), na++;
    let b = 0;
    let nb = 0;
    for (let v = Math.ceil(botAbs + gap); v <= Math.ceil(botAbs + gap + s); v++) if (v < Lv) (b += get(u, v)), nb++;
    surA.push(a / Math.max(1, na));
    surB.push(b / Math.max(1, nb));
  }
  const badEdge = (arr: number[], ref: number): number => arr.filter((t) => !Number.isFinite(t) || Math.abs(t - ref) > 1).length / arr.length;
  const edgeOutliers = Math.max(badEdge(tops, topAbs), badEdge(bots, botAbs));
  const edgeStd = Math.max(_robustStd(tops.filter(Number.isFinite)), _robustStd(bots.filter(Number.isFinite)));
  const uni = _robustStd(inner) / contrast;
  const sur = Math.max(_robustStd(surA), _robustStd(surB)) / contrast;

  // --- ends: 50 % crossings of the along profile on the midline rows ---
  const midRows = inRows.length > 2 ? inRows.slice(Math.floor(inRows.length * 0.2), Math.ceil(inRows.length * 0.8)) : inRows;
  const pad = 2 * f + 4 + s;
  const u0 = Math.max(0, uA - pad);
  const u1 = Math.min(Lu - 1, uB + pad);
  const along = new Float64Array(u1 - u0 + 1);
  for (let u = u0; u <= u1; u++) {
    let m = 0;
    for (const v of midRows) m += get(u, v);
    along[u - u0] = m / midRows.length;
  }
  const centre: number[] = [];
  for (let u = cu0; u <= cu1; u++) centre.push(along[u - u0]);
  const inAlong = _median(centre);
  const outLevel = (outA + outB) / 2;
  const lvl = (q: number) => outLevel + q * (inAlong - outLevel);
  const sL = cu0 - u0;
  const sR = cu1 - u0;
  const left = _crossing(along, sL, -1, lvl(0.5), sign);
  const right = _crossing(along, sR, 1, lvl(0.5), sign);
  if (!Number.isFinite(left) || !Number.isFinite(right)) return null; // runs into the frame
  const lengthPx = right - left;
  if (lengthPx < ctx.minLenFrac * Lu || lengthPx < 8 * thickness) return null;
  const width2080 = (st: number, dir: 1 | -1) => Math.abs(_crossing(along, st, dir, lvl(0.2), sign) - _crossing(along, st, dir, lvl(0.8), sign));
  const endW = Math.max(width2080(sL, -1), width2080(sR, 1));

  // --- label: text-like components of the same polarity next to the bar (work resolution) ---
  const label = _findLabel(ctx, c, labels, stats, n);

  // --- confidence ---
  const sContrast = clamp01((contrast - 0.04) / 0.12);
  const sSym = clamp01(contrast / Math.max(cA, cB) / 0.5);
  const sStraight = clamp01(1 - (edgeStd - 0.35) / 0.65) * clamp01(1 - (edgeOutliers - 0.05) / 0.25);
  const sUni = clamp01(1 - (uni - 0.1) / 0.25);
  const sSur = Math.sqrt(clamp01(1 - (sur - 0.15) / 0.6));
  const sEnd = Number.isFinite(endW) ? clamp01(1 - (endW - 4) / 5) : 0;
  const cx = (horiz ? (left + right) / 2 + u0 : mid) / W;
  const cy = (horiz ? mid : (left + right) / 2 + u0) / H;
  const margin = Math.min(cx, 1 - cx, cy, 1 - cy);
  const sPos = margin < 0.2 ? 1 : 1 - (0.3 * (margin - 0.2)) / 0.3;
  const sLabel = label ? 1 : 0.9;
  const confidence = sContrast * sSym * sStraight * sUni * sSur * sEnd * sPos * sLabel;

  const e0 = left + u0 + 0.5;
  const e1 = right + u0 - 0.5;
  const bar: ScaleBar = {
    x0: horiz ? e0 : mid,
    y0: horiz ? mid : e0,
    x1: horiz ? e1 : mid,
    y1: horiz ? mid : e1,
    lengthPx,
    thicknessPx: thickness,
    orientation: c.orientation,
    polarity,
    confidence: Math.round(confidence * 1000) / 1000,
  };
  if (label) bar.labelBox = label;
  const plate = _findPlate(raster, bar, outLevel, inLevel, label);
  if (plate) bar.plate = plate;
  return bar;
}

/** Union box (full-resolution px) of small components of the bar's polarity close to the bar. */
function _findLabel(ctx: Ctx, c: Candidate, labels: Int32Array, stats: Int32Array, n: number): BoxPx | undefined {
  const { f } = ctx;
  const horiz = c.orientation === 'horizontal';
  const len = horiz ? c.bw : c.bh;
  const m = Math.max(4 * c.tW + 4, Math.round(0.3 * len));
  const rx0 = c.left - m;
  const ry0 = c.top - m;
  const rx1 = c.left + c.bw + m;
  const ry1 = c.top + c.bh + m;
  const glyphs: { l: number; t: number; r: number; b: number }[] = [];
  for (let id = 1; id < n; id++) {
    if (id === c.id) continue;
    const l = stats[id * 5 + ST_LEFT];
    const t = stats[id * 5 + ST_TOP];
    const bw = stats[id * 5 + ST_W];
    const bh = stats[id * 5 + ST_H];
    const area = stats[id * 5 + ST_AREA];
    if (l < rx0 || t < ry0 || l + bw > rx1 || t + bh > ry1) continue;
    if (area < 3 || Math.max(bw, bh) > 0.4 * len || Math.max(bw, bh) < 2 || bw > 3 * bh) continue;
    glyphs.push({ l, t, r: l + bw, b: t + bh });
  }
  if (glyphs.length < 2) return undefined;
  // keep one text line: glyphs of similar height whose centres line up (horizontal text)
  const hs = glyphs.map((g) => g.b - g.t);
  const hMed = _median(hs);
  const cMed = _median(glyphs.map((g) => (g.t + g.b) / 2));
  const line = glyphs.filter((g) => {
    const gh = g.b - g.t;
    return gh >= 0.5 * hMed && gh <= 2 * hMed && Math.abs((g.t + g.b) / 2 - cMed) <= 0.6 * hMed;
  });
  if (line.length < 2 || line.length > 60) return undefined;
  const x0 = Math.min(...line.map((g) => g.l));
  const y0 = Math.min(...line.map((g) => g.t));
  const x1 = Math.max(...line.map((g) => g.r));
  const y1 = Math.max(...line.map((g) => g.b));
  void labels;
  return { x: x0 * f, y: y0 * f, w: (x1 - x0) * f, h: (y1 - y0) * f };
}

/**
 * Grow a box from the bar while its border rows/columns are mostly at the surrounding level; it is a
 * plate when the growth stops on every side at a contrast edge inside the image.
 */
function _findPlate(r: GrayRaster, bar: ScaleBar, outLevel: number, inLevel: number, label?: BoxPx): BoxPx | undefined {
  const { width: W, height: H, data: d } = r;
  const c = Math.abs(inLevel - outLevel);
  const tol = Math.max(0.04, 0.2 * c);
  let x0 = Math.floor(Math.min(bar.x0, bar.x1) - bar.thicknessPx);
  let x1 = Math.ceil(Math.max(bar.x0, bar.x1) + bar.thicknessPx);
  let y0 = Math.floor(Math.min(bar.y0, bar.y1) - bar.thicknessPx);
  let y1 = Math.ceil(Math.max(bar.y0, bar.y1) + bar.thicknessPx);
  if (label) {
    x0 = Math.min(x0, label.x);
    y0 = Math.min(y0, label.y);
    x1 = Math.max(x1, label.x + label.w);
    y1 = Math.max(y1, label.y + label.h);
  }
  x0 = Math.max(0, x0);
  y0 = Math.max(0, y0);
  x1 = Math.min(W - 1, x1);
  y1 = Math.min(H - 1, y1);
  const fracAt = (horizLine: boolean, k: number, a: number, b: number): number => {
    let ok = 0;
    let n = 0;
    const st = Math.max(1, Math.floor((b - a + 1) / 200));
    for (let t = a; t <= b; t += st) {
      const v = horizLine ? d[k * W + t] : d[t * W + k];
      if (Math.abs(v - outLevel) <= tol) ok++;
      n++;
    }
    return n ? ok / n : 0;
  };
  const stopped = [false, false, false, false]; // left, right, top, bottom: stopped at an edge inside the image
  const maxArea = 0.1 * W * H;
  for (let iter = 0; iter < W + H; iter++) {
    let grew = false;
    if (x0 > 0 && !stopped[0]) {
      if (fracAt(false, x0 - 1, y0, y1) >= 0.7) (x0--, (grew = true));
      else stopped[0] = true;
    }
    if (x1 < W - 1 && !stopped[1]) {
      if (fracAt(false, x1 + 1, y0, y1) >= 0.7) (x1++, (grew = true));
      else stopped[1] = true;
    }
    if (y0 > 0 && !stopped[2]) {
      if (fracAt(true, y0 - 1, x0, x1) >= 0.7) (y0--, (grew = true));
      else stopped[2] = true;
    }
    if (y1 < H - 1 && !stopped[3]) {
      if (fracAt(true, y1 + 1, x0, x1) >= 0.7) (y1++, (grew = true));
      else stopped[3] = true;
    }
    if (!grew || (x1 - x0 + 1) * (y1 - y0 + 1) > maxArea) break;
  }
  if ((x1 - x0 + 1) * (y1 - y0 + 1) > maxArea) return undefined;
  // a plate ends at a contrast edge inside the image on at least three sides
  if (stopped.filter(Boolean).length < 3) return undefined;
  // and the ring just outside it is mostly not at the plate level
  let diff = 0;
  let total = 0;
  const ring = 3;
  for (let y = Math.max(0, y0 - ring); y <= Math.min(H - 1, y1 + ring); y++) {
    for (let x = Math.max(0, x0 - ring); x <= Math.min(W - 1, x1 + ring); x++) {
      if (x >= x0 && x <= x1 && y >= y0 && y <= y1) continue;
      total++;
      if (Math.abs(d[y * W + x] - outLevel) > tol) diff++;
    }
  }
  if (total === 0 || diff < 0.7 * total) return undefined;
  return { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 };
}
