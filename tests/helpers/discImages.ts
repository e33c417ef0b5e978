/**
 * Simple synthetic test images for the segmentation/measurement tests (invented, no real data):
 * a disc (or ellipse) on a dark or bright background, a smooth-noise rim ring and a rough-noise
 * core. Pixel centres are classified by exact geometry, so the truth radii are known.
 */
import { createRaster, type GrayRaster } from '../../src/core/image/raster.js';
import { createRng } from '../../src/core/random.js';

export interface DiscImageOptions {
  width?: number;
  height?: number;
  cx?: number;
  cy?: number;
  /** Outer semi-axes (px) along x and y (equal → circle). */
  outerA?: number;
  outerB?: number;
  /** Boundary radius scale: boundary = outer ellipse scaled by (1 − width/outer) … simplest: a function of θ (deg) giving the boundary radius px. */
  boundaryAt?: (thetaDeg: number) => number;
  /** Noise std of the rim and the core (gray levels 0..1). */
  rimStd?: number;
  coreStd?: number;
  /** Mean gray of the rim (may depend on θ for a slanted rim) and the core. */
  rimMean?: number | ((thetaDeg: number) => number);
  coreMean?: number;
  background?: number;
  backgroundStd?: number;
  seed?: number;
  /** Multiply by a radial vignetting 1 − v·(r/rmax)². */
  vignette?: number;
}

export interface DiscImage {
  raster: GrayRaster;
  cx: number;
  cy: number;
  outerRadiusAt: (thetaDeg: number) => number;
  boundaryRadiusAt: (thetaDeg: number) => number;
  /** Mean true width over 360 rays at 1° (px). */
  meanWidthPx: number;
}

export function makeDiscImage(o: DiscImageOptions = {}): DiscImage {
  const W = o.width ?? 800;
  const H = o.height ?? 600;
  const cx = o.cx ?? W / 2 - 0.3;
  const cy = o.cy ?? H / 2 + 0.2;
  const A = o.outerA ?? 240;
  const B = o.outerB ?? A;
  const boundaryAt = o.boundaryAt ?? ((t: number) => 0.75 * outerAt(t));
  function outerAt(t: number): number {
    const th = (t * Math.PI) / 180;
    return (A * B) / Math.hypot(B * Math.cos(th), A * Math.sin(th));
  }
  const rng = createRng(o.seed ?? 3);
  const rnd = (): number => rng.nextFloat();
  const gauss = (): number => {
    const u = 1 - rnd();
    const v = rnd();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
  const rimStd = o.rimStd ?? 0.01;
  const coreStd = o.coreStd ?? 0.1;
  const rimMean = o.rimMean ?? 0.55;
  const coreMean = o.coreMean ?? 0.5;
  const bg = o.background ?? 0.08;
  const bgStd = o.backgroundStd ?? 0.005;
  const data = new Float32Array(W * H);
  const rmax = Math.hypot(W, H) / 2;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const dx = x - cx;
      const dy = y - cy;
      const r = Math.hypot(dx, dy);
      let t = (Math.atan2(-dy, dx) * 180) / Math.PI;
      if (t < 0) t += 360;
      let v: number;
      if (r > outerAt(t)) v = bg + bgStd * gauss();
      else if (r > boundaryAt(t)) v = (typeof rimMean === 'number' ? rimMean : rimMean(t)) + rimStd * gauss();
      else v = coreMean + coreStd * gauss();
      if (o.vignette) v *= 1 - o.vignette * (r / rmax) ** 2;
      data[y * W + x] = Math.min(1, Math.max(0, v));
    }
  }
  let s = 0;
  for (let i = 0; i < 360; i++) s += outerAt(i) - boundaryAt(i);
  return { raster: createRaster(W, H, data), cx, cy, outerRadiusAt: outerAt, boundaryRadiusAt: boundaryAt, meanWidthPx: s / 360 };
}

/** Local standard deviation (box window w, reflect borders) — a test-side roughness feature. */
export function testLocalStd(r: GrayRaster, w: number): GrayRaster {
  const { width: W, height: H, data } = r;
  const h = (w - 1) >> 1;
  // integral images
  const S = new Float64Array((W + 1) * (H + 1));
  const S2 = new Float64Array((W + 1) * (H + 1));
  for (let y = 0; y < H; y++) {
    let a = 0;
    let b = 0;
    for (let x = 0; x < W; x++) {
      const v = data[y * W + x];
      a += v;
      b += v * v;
      S[(y + 1) * (W + 1) + x + 1] = S[y * (W + 1) + x + 1] + a;
      S2[(y + 1) * (W + 1) + x + 1] = S2[y * (W + 1) + x + 1] + b;
    }
  }
  const out = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    const y0 = Math.max(0, y - h);
    const y1 = Math.min(H, y + h + 1);
    for (let x = 0; x < W; x++) {
      const x0 = Math.max(0, x - h);
      const x1 = Math.min(W, x + h + 1);
      const n = (y1 - y0) * (x1 - x0);
      const s = S[y1 * (W + 1) + x1] - S[y0 * (W + 1) + x1] - S[y1 * (W + 1) + x0] + S[y0 * (W + 1) + x0];
      const s2 = S2[y1 * (W + 1) + x1] - S2[y0 * (W + 1) + x1] - S2[y1 * (W + 1) + x0] + S2[y0 * (W + 1) + x0];
      const m = s / n;
      out[y * W + x] = Math.sqrt(Math.max(0, s2 / n - m * m));
    }
  }
  return createRaster(W, H, out);
}
