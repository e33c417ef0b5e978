/**
 * The pixel features at chosen pixels (src/core/learn/features.ts `pixelFeaturesAt`) against a
 * brute-force reference written here from the definitions (window means by direct summation with
 * reflect-101 borders, logs, structure tensor, entropy from a histogram of the clipped window), on a
 * small textured image with windows that reach over every border; and the entropy equal bit for bit
 * to the full-image kernel (texture/localEntropy.ts) whatever order the pixels come in.
 */
import { describe, expect, it } from 'vitest';
import { createRaster, type GrayRaster } from '../../../src/core/image/raster.js';
import { pixelFeatureNames, pixelFeaturesAt, windowPxAt, WINDOW_FEATURES } from '../../../src/core/learn/features.js';
import { createRng } from '../../../src/core/random.js';
import { entropyBins, localEntropy } from '../../../src/core/texture/localEntropy.js';
import { quantile } from '../../../src/core/segment/quantiles.js';

/** A 61 × 47 image: a bright disc with fine noise on a darker, smoother ground, and a stripe pattern. */
function image(): GrayRaster {
  const W = 61;
  const H = 47;
  const rng = createRng(3);
  const d = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const r = Math.hypot(x - 30, y - 22);
      const stripes = 0.05 * Math.sin(0.9 * x + 0.3 * y);
      d[y * W + x] = (r < 16 ? 0.6 + 0.15 * (rng.nextFloat() - 0.5) : 0.25 + 0.03 * (rng.nextFloat() - 0.5)) + stripes;
    }
  }
  return createRaster(W, H, d);
}

const reflect = (i: number, n: number): number => (i < 0 ? -i : i > n - 1 ? 2 * (n - 1) - i : i);

/** Mean of f over the (2h + 1)² window at (x, y), reflect-101 borders, by direct summation. */
function windowMean(f: (i: number) => number, W: number, H: number, x: number, y: number, h: number): number {
  let s = 0;
  for (let dy = -h; dy <= h; dy++) for (let dx = -h; dx <= h; dx++) s += f(reflect(y + dy, H) * W + reflect(x + dx, W));
  return s / (2 * h + 1) ** 2;
}

function sobelAt(d: Float32Array, W: number, H: number, x: number, y: number): [number, number] {
  const v = (dx: number, dy: number): number => d[reflect(y + dy, H) * W + reflect(x + dx, W)];
  return [v(1, -1) - v(-1, -1) + 2 * (v(1, 0) - v(-1, 0)) + v(1, 1) - v(-1, 1), v(-1, 1) - v(-1, -1) + 2 * (v(0, 1) - v(0, -1)) + v(1, 1) - v(1, -1)];
}

/** The feature vector of (x, y) from the definitions in the module comment of features.ts. */
function reference(img: GrayRaster, umPerPx: number, windowsUm: number[], c: { x: number; y: number }, x: number, y: number, med: number, bins: Uint8Array): number[] {
  const { width: W, height: H, data: d } = img;
  const g = (i: number): [number, number] => sobelAt(d, W, H, i % W, Math.floor(i / W));
  const out = [Math.log(Math.max(windowMean((i) => d[i], W, H, x, y, 1), 1e-3)) - med];
  for (const wUm of windowsUm) {
    const h = (windowPxAt(wUm, umPerPx, W, H) - 1) / 2;
    const mean = windowMean((i) => d[i], W, H, x, y, h);
    const second = windowMean((i) => d[i] * d[i], W, H, x, y, h);
    const jxx = windowMean((i) => g(i)[0] ** 2, W, H, x, y, h);
    const jyy = windowMean((i) => g(i)[1] ** 2, W, H, x, y, h);
    const jxy = windowMean((i) => g(i)[0] * g(i)[1], W, H, x, y, h);
    // entropy over the window clipped to the image, 32 bins
    const hist = new Map<number, number>();
    let n = 0;
    for (let yy = Math.max(0, y - h); yy <= Math.min(H - 1, y + h); yy++) {
      for (let xx = Math.max(0, x - h); xx <= Math.min(W - 1, x + h); xx++) {
        hist.set(bins[yy * W + xx], (hist.get(bins[yy * W + xx]) ?? 0) + 1);
        n++;
      }
    }
    let ent = 0;
    for (const k of hist.values()) ent -= (k / n) * Math.log2(k / n);
    const th = Math.atan2(y - c.y, x - c.x);
    const t = jxx + jyy;
    out.push(
      Math.log(mean) - med,
      0.5 * Math.log(second - mean * mean + 1e-8) - Math.log(mean),
      ent,
      0.5 * Math.log(t + 1e-8) - Math.log(mean),
      Math.sqrt((jxx - jyy) ** 2 + 4 * jxy * jxy) / t,
      ((jxx - jyy) * Math.cos(2 * th) + 2 * jxy * Math.sin(2 * th)) / t,
    );
  }
  return out;
}

describe('pixel features at chosen pixels', () => {
  const img = image();
  const { width: W, height: H } = img;
  const umPerPx = 10;
  const windowsUm = [30, 70, 110]; // 3, 7 and 11 px: the largest reaches over every border near it
  const centre = { x: 29.6, y: 22.3 };
  const bins = entropyBins(img);
  const logs = Array.from({ length: W * H }, (_, i) => Math.log(Math.max(windowMean((j) => img.data[j], W, H, i % W, Math.floor(i / W), 1), 1e-3)));
  const med = quantile(Float32Array.from(logs), 0.5);
  const all = Int32Array.from({ length: W * H }, (_, i) => i);
  const X = pixelFeaturesAt(img, umPerPx, windowsUm, centre, all);
  const F = pixelFeatureNames(windowsUm).length;

  it('gives the features of their definitions at every pixel, borders included', () => {
    expect(F).toBe(1 + WINDOW_FEATURES.length * windowsUm.length);
    expect(X.length).toBe(W * H * F);
    // contrast = ½ ln(mean of squares − squared mean) from float32 means (as the maps it replaced
    // were stored): the difference of two float32 numbers loses a few digits on smooth ground
    const contrast = new Set(windowsUm.map((_, k) => 1 + k * WINDOW_FEATURES.length + 1));
    let worst = 0;
    let worstContrast = 0;
    for (const i of all) {
      const ref = reference(img, umPerPx, windowsUm, centre, i % W, Math.floor(i / W), med, bins);
      for (let f = 0; f < F; f++) {
        const d = Math.abs(X[i * F + f] - ref[f]);
        if (contrast.has(f)) worstContrast = Math.max(worstContrast, d);
        else worst = Math.max(worst, d);
      }
    }
    expect(worst).toBeLessThan(2e-5);
    expect(worstContrast).toBeLessThan(1e-3);
  });

  it('gives the entropy of the full-image kernel bit for bit, and the same values in any pixel order', () => {
    windowsUm.forEach((wUm, k) => {
      const map = localEntropy(img, W, H, windowPxAt(wUm, umPerPx, W, H)).data;
      const f = 1 + k * WINDOW_FEATURES.length + 2;
      for (const i of all) expect(X[i * F + f]).toBe(map[i]);
    });
    const rng = createRng(5);
    const some = Int32Array.from({ length: 400 }, () => rng.int(W * H));
    const Y = pixelFeaturesAt(img, umPerPx, windowsUm, centre, some);
    some.forEach((i, k) => expect(Array.from(Y.subarray(k * F, (k + 1) * F))).toEqual(Array.from(X.subarray(i * F, (i + 1) * F))));
  });
});
