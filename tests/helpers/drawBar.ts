/**
 * Test-image drawing for scale-bar tests: a seeded textured "fracture surface" disc on a plain
 * background, plus bars, plates, label-like glyph blocks, SEM-style data strips, blur, noise and a JPEG
 * round trip. All shapes are drawn with exact area coverage (a pixel centred at integer (x, y) covers
 * [x − ½, x + ½) × [y − ½, y + ½)), so a bar drawn from edge xa to edge xb has true length xb − xa px.
 * Invented test scenes; nothing here depicts a real specimen.
 */
import jpeg from 'jpeg-js';
import { createRaster, type GrayRaster } from '../../src/core/image/raster.js';

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gauss(rng: () => number): number {
  const u = Math.max(1e-12, rng());
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}

export function blank(width: number, height: number, value: number): GrayRaster {
  return createRaster(width, height, new Float32Array(width * height).fill(value));
}

/** Blend `value` into the continuous rectangle [x0, x1) × [y0, y1) with area coverage. */
export function fillRect(r: GrayRaster, x0: number, y0: number, x1: number, y1: number, value: number): void {
  const { width: W, height: H, data } = r;
  const px0 = Math.max(0, Math.floor(x0 + 0.5));
  const px1 = Math.min(W - 1, Math.ceil(x1 - 0.5));
  const py0 = Math.max(0, Math.floor(y0 + 0.5));
  const py1 = Math.min(H - 1, Math.ceil(y1 - 0.5));
  for (let y = py0; y <= py1; y++) {
    const cy = Math.max(0, Math.min(y + 0.5, y1) - Math.max(y - 0.5, y0));
    if (cy <= 0) continue;
    for (let x = px0; x <= px1; x++) {
      const cx = Math.max(0, Math.min(x + 0.5, x1) - Math.max(x - 0.5, x0));
      const c = cx * cy;
      if (c <= 0) continue;
      const i = y * W + x;
      data[i] = data[i] * (1 - c) + value * c;
    }
  }
}

/** Separable box blur of radius k (in place), repeated `passes` times (≈ Gaussian for passes ≥ 3). */
export function boxBlur(r: GrayRaster, k: number, passes = 1): void {
  const { width: W, height: H, data } = r;
  const tmp = new Float32Array(Math.max(W, H));
  for (let p = 0; p < passes; p++) {
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        let s = 0;
        for (let d = -k; d <= k; d++) s += data[y * W + Math.min(W - 1, Math.max(0, x + d))];
        tmp[x] = s / (2 * k + 1);
      }
      data.set(tmp.subarray(0, W), y * W);
    }
    for (let x = 0; x < W; x++) {
      for (let y = 0; y < H; y++) {
        let s = 0;
        for (let d = -k; d <= k; d++) s += data[Math.min(H - 1, Math.max(0, y + d)) * W + x];
        tmp[y] = s / (2 * k + 1);
      }
      for (let y = 0; y < H; y++) data[y * W + x] = tmp[y];
    }
  }
}

/** Add seeded Gaussian noise of standard deviation `sigma` (clamped to 0..1). */
export function addNoise(r: GrayRaster, sigma: number, seed: number): void {
  const rng = mulberry32(seed);
  const d = r.data;
  for (let i = 0; i < d.length; i++) d[i] = Math.min(1, Math.max(0, d[i] + sigma * gauss(rng)));
}

/** Seeded rough texture disc (smoothed noise, a stand-in for a fracture surface). */
export function textureDisc(r: GrayRaster, cx: number, cy: number, radius: number, seed: number, mean = 0.55, amp = 0.25): void {
  const { width: W, height: H } = r;
  const tex = blank(W, H, 0);
  const rng = mulberry32(seed);
  for (let i = 0; i < tex.data.length; i++) tex.data[i] = rng();
  boxBlur(tex, 2, 2);
  // stretch to mean ± amp
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of tex.data) (lo = Math.min(lo, v)), (hi = Math.max(hi, v));
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const dd = Math.hypot(x - cx, y - cy);
      const c = Math.min(1, Math.max(0, radius + 0.5 - dd));
      if (c <= 0) continue;
      const t = mean + amp * (2 * (tex.data[y * W + x] - lo) / (hi - lo) - 1);
      const i = y * W + x;
      r.data[i] = r.data[i] * (1 - c) + t * c;
    }
  }
}

export interface BarSpec {
  /** Left and right edges (continuous, px) for horizontal; top/bottom for vertical. */
  a: number;
  b: number;
  /** Edge of the bar across: top edge (horizontal) or left edge (vertical), px. */
  across: number;
  thickness: number;
  value: number;
  vertical?: boolean;
  /** End caps: height (px across) of ticks at both ends, centred on the bar, width = thickness. */
  capHeight?: number;
}

/** Draw a bar; returns its true edge-to-edge length in px. */
export function drawBar(r: GrayRaster, s: BarSpec): number {
  const t = s.thickness;
  if (!s.vertical) fillRect(r, s.a, s.across, s.b, s.across + t, s.value);
  else fillRect(r, s.across, s.a, s.across + t, s.b, s.value);
  if (s.capHeight && s.capHeight > t) {
    // ticks above and below the bar only (no overlap, so coverage stays exact)
    const c0 = s.across + t / 2 - s.capHeight / 2;
    const c1 = c0 + s.capHeight;
    const cw = Math.max(2, t);
    for (const e of [s.a, s.b - cw]) {
      if (!s.vertical) {
        fillRect(r, e, c0, e + cw, s.across, s.value);
        fillRect(r, e, s.across + t, e + cw, c1, s.value);
      } else {
        fillRect(r, c0, e, s.across, e + cw, s.value);
        fillRect(r, s.across + t, e, c1, e + cw, s.value);
      }
    }
  }
  return s.b - s.a;
}

/** Text-like glyph blocks ("500 µm"): `n` small rectangles with holes, left edge x, top y, glyph height gh. */
export function drawLabel(r: GrayRaster, x: number, y: number, gh: number, value: number, n = 6, seed = 7): { x: number; y: number; w: number; h: number } {
  const rng = mulberry32(seed);
  const gw = Math.max(3, Math.round(gh * 0.6));
  const stroke = Math.max(1, Math.round(gh / 7));
  let cx = x;
  for (let i = 0; i < n; i++) {
    if (i === 3) {
      cx += gw; // word gap
      continue;
    }
    // a glyph: outline box with a random middle stroke
    fillRect(r, cx, y, cx + gw, y + stroke, value);
    fillRect(r, cx, y + gh - stroke, cx + gw, y + gh, value);
    fillRect(r, cx, y, cx + stroke, y + gh, value);
    if (rng() < 0.6) fillRect(r, cx + gw - stroke, y, cx + gw, y + gh, value);
    if (rng() < 0.5) fillRect(r, cx, y + gh / 2, cx + gw, y + gh / 2 + stroke, value);
    cx += gw + Math.max(2, stroke * 2);
  }
  return { x, y, w: cx - x, h: gh };
}

/** Wavy ridge / crack of varying intensity through the texture (not a uniform rectangle). */
export function drawRidge(r: GrayRaster, x0: number, x1: number, y: number, value: number, seed: number, vertical = false): void {
  const rng = mulberry32(seed);
  let off = 0;
  for (let u = x0; u < x1; u++) {
    off += (rng() - 0.5) * 0.8;
    const th = 2 + 2 * rng();
    const v = value * (0.7 + 0.3 * rng());
    if (!vertical) fillRect(r, u - 0.5, y + off, u + 0.5, y + off + th, v);
    else fillRect(r, y + off, u - 0.5, y + off + th, u + 0.5, v);
  }
}

/** Round trip through baseline JPEG (jpeg-js) to get real block artefacts and ringing. */
export function jpegRoundTrip(r: GrayRaster, quality: number): GrayRaster {
  const { width: W, height: H, data } = r;
  const rgba = new Uint8Array(W * H * 4);
  for (let i = 0; i < W * H; i++) {
    const v = Math.round(Math.min(1, Math.max(0, data[i])) * 255);
    rgba[4 * i] = rgba[4 * i + 1] = rgba[4 * i + 2] = v;
    rgba[4 * i + 3] = 255;
  }
  const enc = jpeg.encode({ data: rgba, width: W, height: H }, quality);
  const dec = jpeg.decode(enc.data, { useTArray: true });
  const out = new Float32Array(W * H);
  for (let i = 0; i < W * H; i++) out[i] = dec.data[4 * i] / 255;
  return createRaster(W, H, out);
}

/** A typical optical scene: dark background, textured disc in the middle. */
export function opticalScene(W: number, H: number, seed: number, bg = 0.08): GrayRaster {
  const r = blank(W, H, bg);
  textureDisc(r, W / 2, H / 2, Math.min(W, H) * 0.36, seed);
  return r;
}
