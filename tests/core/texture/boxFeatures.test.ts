import { describe, expect, it } from 'vitest';
import { isFractozoneError } from '../../../src/core/errors.js';
import { createRaster, type GrayRaster } from '../../../src/core/image/raster.js';
import {
  boxMean,
  gradientEnergy,
  gradientEnergyPointwise,
  highPassEnergy,
  highPassEnergyPointwise,
  localStd,
  localVariance,
} from '../../../src/core/texture/index.js';
import { planStrips } from '../../../src/core/texture/kernels/strips.js';

function seededRaster(W: number, H: number, seed: number): GrayRaster {
  let a = seed >>> 0;
  const d = new Float32Array(W * H);
  for (let i = 0; i < d.length; i++) {
    a = (Math.imul(a, 1664525) + 1013904223) >>> 0;
    d[i] = a / 4294967296;
  }
  return createRaster(W, H, d);
}

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    return isFractozoneError(e) ? e.code : `not a FractozoneError: ${String(e)}`;
  }
  return undefined;
}

/** Direct two-pass variance of the window at (x, y), window fully inside the image (definition). */
function windowVariance(r: GrayRaster, x: number, y: number, w: number): number {
  const h = (w - 1) / 2;
  let s = 0;
  for (let yy = y - h; yy <= y + h; yy++) for (let xx = x - h; xx <= x + h; xx++) s += r.data[yy * r.width + xx];
  const m = s / (w * w);
  let q = 0;
  for (let yy = y - h; yy <= y + h; yy++) for (let xx = x - h; xx <= x + h; xx++) q += (r.data[yy * r.width + xx] - m) ** 2;
  return q / (w * w);
}

describe('localVariance / localStd', () => {
  it('zero on a constant image, std = sqrt(variance)', () => {
    const c = createRaster(9, 7, new Float32Array(63).fill(0.7));
    expect(Math.max(...localVariance(c, 5).data)).toBe(0);
    const r = seededRaster(20, 15, 3);
    const v = localVariance(r, 5).data;
    const s = localStd(r, 5).data;
    for (let i = 0; i < v.length; i++) expect(s[i]).toBeCloseTo(Math.sqrt(v[i]), 6);
  });

  it('a two-level step: variance p(1−p)·Δ² with p the fraction of the window past the step', () => {
    // Bernoulli variance, textbook: window 5 wide, columns x ≥ 10 hold 1, others 0
    const W = 20;
    const d = new Float32Array(W * 9);
    for (let y = 0; y < 9; y++) for (let x = 10; x < W; x++) d[y * W + x] = 1;
    const v = localVariance(createRaster(W, 9, d), 5).data;
    for (const [x, k] of [[8, 1], [9, 2], [10, 3], [11, 4]]) {
      const p = k / 5;
      expect(v[4 * W + x]).toBeCloseTo(p * (1 - p), 6);
    }
  });

  it('is exact across strip seams of a tall image (strip plan with ≥ 2 strips)', () => {
    const W = 4096;
    const H = 1100;
    expect(planStrips(W, H, 7).length).toBeGreaterThan(1);
    const r = seededRaster(W, H, 11);
    const v = localVariance(r, 15).data;
    const m = boxMean(r, 15).data; // OpenCV boxFilter, strip-wise
    const seam = planStrips(W, H, 7)[0].y1;
    for (let y = seam - 9; y <= seam + 9; y++) {
      for (const x of [7, 1000, 4088]) {
        expect(Math.abs(v[y * W + x] - windowVariance(r, x, y, 15))).toBeLessThan(1e-6);
        let s = 0;
        for (let yy = y - 7; yy <= y + 7; yy++) for (let xx = x - 7; xx <= x + 7; xx++) s += r.data[yy * W + xx];
        expect(Math.abs(m[y * W + x] - s / 225)).toBeLessThan(1e-6);
      }
    }
  });
});

describe('gradient energy', () => {
  it('a ramp of slope s gives (8s)² inside, 0 across a reflected edge row', () => {
    // Sobel kernel [−1 0 1]⊗[1 2 1] sums 8·s on a ramp (Gonzalez & Woods §3.6); reflect-101 mirrors
    // the first row onto the second, so a vertical ramp has gy = 0 on the top row.
    const W = 12;
    const H = 10;
    const s = 0.01;
    const d = new Float32Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) d[y * W + x] = s * x;
    const g = gradientEnergyPointwise(createRaster(W, H, d)).data;
    expect(g[5 * W + 5]).toBeCloseTo((8 * s) ** 2, 8);
    expect(g[5 * W + 0]).toBeCloseTo(0, 8); // left edge: x − 1 mirrored to x + 1
    const t = new Float32Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) t[y * W + x] = s * y;
    const gt = gradientEnergyPointwise(createRaster(W, H, t)).data;
    expect(gt[0 * W + 5]).toBeCloseTo(0, 8);
    expect(gt[4 * W + 5]).toBeCloseTo((8 * s) ** 2, 8);
  });

  it('box average is linear in the area fraction of two textures (midpoint on the boundary)', () => {
    // left part flat, right part a ramp of slope 0.02 from x = 40: pointwise Sobel energy is 0 for
    // x ≤ 39, E/4 at x = 40 (half the slope reaches the centre), E = (8·0.02)² for x ≥ 41. A box
    // average of width 11 then equals (#columns ≥ 41 + 0.25·[40 inside]) · E / 11, so the half
    // level E/2 (5.5 columns) is crossed at x = 40 + (5.5 − 5.25) = 40.25.
    const W = 80;
    const H = 40;
    const d = new Float32Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) d[y * W + x] = x >= 40 ? 0.25 + 0.02 * (x - 40) : 0.25;
    const r = createRaster(W, H, d);
    const E = (8 * 0.02) ** 2;
    const p = gradientEnergyPointwise(r).data;
    expect(p[20 * W + 39]).toBeCloseTo(0, 8);
    expect(p[20 * W + 40]).toBeCloseTo(E / 4, 7);
    expect(p[20 * W + 41]).toBeCloseTo(E, 7);
    const e = gradientEnergy(r, 11).data;
    const y = 20;
    const inner = e[y * W + 10];
    const outer = e[y * W + 60];
    expect(inner).toBeCloseTo(0, 8);
    expect(outer).toBeCloseTo(E, 7);
    for (const [x, cols] of [[36, 1.25], [40, 5.25], [44, 9.25]]) expect(e[y * W + x]).toBeCloseTo((cols * E) / 11, 7);
    const mid = (inner + outer) / 2;
    let cross = -1;
    for (let x = 10; x < 70; x++) {
      const a = e[y * W + x];
      const b = e[y * W + x + 1];
      if (a < mid && b >= mid) cross = x + (mid - a) / (b - a);
    }
    expect(cross).toBeCloseTo(40.25, 4);
  });
});

describe('high-pass energy and box mean', () => {
  it('high-pass energy is zero on a constant and on a linear ramp inside the image', () => {
    const W = 30;
    const d = new Float32Array(W * W);
    for (let y = 0; y < W; y++) for (let x = 0; x < W; x++) d[y * W + x] = 0.01 * x + 0.02 * y;
    const e = highPassEnergy(createRaster(W, W, d), 5).data;
    expect(e[15 * W + 15]).toBeLessThan(1e-10);
    const p = highPassEnergyPointwise(createRaster(W, W, d), 5).data;
    expect(p[15 * W + 15]).toBeLessThan(1e-10);
  });
  it('box mean of a constant is the constant; of a 3×3 delta is 1/9 nearby', () => {
    const d = new Float32Array(49);
    d[24] = 1;
    const m = boxMean(createRaster(7, 7, d), 3).data;
    expect(m[24]).toBeCloseTo(1 / 9, 7);
    expect(m[16]).toBeCloseTo(1 / 9, 7);
    expect(m[0]).toBe(0);
  });
});

describe('box features refuse bad input', () => {
  const r = createRaster(8, 6);
  it.each([
    ['even window', () => localStd(r, 4)],
    ['window larger than the image', () => localVariance(r, 7)],
    ['fractional window', () => gradientEnergy(r, 3.5)],
    ['window 1', () => highPassEnergy(r, 1)],
    ['not a raster', () => boxMean({ width: 2, height: 2, data: new Float32Array(3) }, 3)],
  ])('%s → BAD_PARAMETER', (_n, f) => {
    expect(codeOf(f)).toBe('BAD_PARAMETER');
  });
  it('NaN pixels → PROCESSING_FAILED', () => {
    const d = new Float32Array(48);
    d[5] = NaN;
    const bad = createRaster(8, 6, d);
    for (const f of [() => localStd(bad, 3), () => gradientEnergy(bad, 3), () => highPassEnergy(bad, 3), () => boxMean(bad, 3)]) {
      expect(codeOf(f)).toBe('PROCESSING_FAILED');
    }
  });
});
