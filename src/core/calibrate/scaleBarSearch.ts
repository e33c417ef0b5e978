/**
 * The search phase of the scale-bar detection (see scaleBar.ts): max/min pooling to a reduced
 * image, local-contrast binarisation, connected components (OpenCV) and the long, thin,
 * constant-thickness candidates; plus the profile helpers the refinement uses.
 */
import { getCv } from '../cv.js';
import type { GrayRaster } from '../image/raster.js';

/** What every phase of the search needs: the image, the pooling factor and the limits. */
export interface Ctx {
  raster: GrayRaster;
  f: number;
  w: number;
  h: number;
  minT: number;
  maxT: number;
  minLenFrac: number;
  maxTW: number;
}

/** A long, thin component of the reduced image: where to look at full resolution. */
export interface Candidate {
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
export function pool(r: GrayRaster, f: number, stride: number): { maxImg: Float32Array; minImg: Float32Array; w: number; h: number } {
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
export function ranges(maxImg: Float32Array, minImg: Float32Array): { range: number; spread: number } {
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

export function binariseAndLabel(
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
    if (polarity === 'light') aboveMean(img, m, delta, b);
    else belowMean(img, m, delta, b);
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

/**
 * 1 where a pixel exceeds its box mean by more than delta (light marks). The per-pixel loops sit in
 * small functions of their own (issue 16; DEVELOPERS.md "Performance notes": a loop inside a long
 * function is optimised late).
 */
function aboveMean(img: Float32Array, m: Float32Array, delta: number, b: Uint8Array): void {
  for (let i = 0; i < b.length; i++) b[i] = img[i] - m[i] > delta ? 1 : 0;
}

/** 1 where a pixel lies more than delta below its box mean (dark marks). */
function belowMean(img: Float32Array, m: Float32Array, delta: number, b: Uint8Array): void {
  for (let i = 0; i < b.length; i++) b[i] = m[i] - img[i] > delta ? 1 : 0;
}

export const ST_LEFT = 0;
export const ST_TOP = 1;
export const ST_W = 2;
export const ST_H = 3;
export const ST_AREA = 4;

/** Long, thin, constant-thickness components at work resolution. */
export function candidates(ctx: Ctx, labels: Int32Array, stats: Int32Array, n: number): Candidate[] {
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


export function median(a: number[]): number {
  if (a.length === 0) return NaN;
  const s = a.slice().sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Robust standard deviation (1.4826 × median absolute deviation). */
export function robustStd(a: number[]): number {
  if (a.length < 2) return 0;
  const m = median(a);
  return 1.4826 * median(a.map((v) => Math.abs(v - m)));
}

/**
 * Position where the profile crosses `level`, walking from index `start` (inside, value on the `sign`
 * side of level) in direction `dir` (±1). Linear interpolation between samples. NaN if never crossed.
 */
export function crossing(p: Float64Array, start: number, dir: 1 | -1, level: number, sign: number): number {
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
