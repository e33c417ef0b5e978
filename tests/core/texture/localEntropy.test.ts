import { describe, expect, it } from 'vitest';
import { isFractozoneError } from '../../../src/core/errors.js';
import { createRaster } from '../../../src/core/image/raster.js';
import { intensityRange, localEntropy } from '../../../src/core/texture/index.js';
import { seeded } from './fixtures.js';

/** Brute force: Shannon entropy (bits) of the in-image pixels of the window (definition, Shannon 1948). */
function bruteEntropy(v: Uint8Array, W: number, H: number, w: number): Float64Array {
  const r = (w - 1) / 2;
  const out = new Float64Array(W * H);
  const h = new Map<number, number>();
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      h.clear();
      let n = 0;
      for (let yy = Math.max(0, y - r); yy <= Math.min(H - 1, y + r); yy++) {
        for (let xx = Math.max(0, x - r); xx <= Math.min(W - 1, x + r); xx++) {
          const b = v[yy * W + xx];
          h.set(b, (h.get(b) ?? 0) + 1);
          n++;
        }
      }
      let e = 0;
      for (const c of h.values()) e -= (c / n) * Math.log2(c / n);
      out[y * W + x] = e;
    }
  }
  return out;
}

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    return isFractozoneError(e) ? e.code : `not a FractozoneError: ${String(e)}`;
  }
  return undefined;
}

describe('localEntropy', () => {
  it('two gray levels 5:4 in a 3×3 window give −(5/9)log2(5/9) − (4/9)log2(4/9) bits', () => {
    // checkerboard: the window centred on a "1" holds five 1s and four 0s
    const W = 5;
    const v = new Uint8Array(W * W);
    for (let y = 0; y < W; y++) for (let x = 0; x < W; x++) v[y * W + x] = (x + y) % 2 === 0 ? 1 : 0;
    const e = localEntropy(v, W, W, 3);
    const expected = -(5 / 9) * Math.log2(5 / 9) - (4 / 9) * Math.log2(4 / 9); // Shannon's definition
    expect(e.data[2 * W + 2]).toBeCloseTo(expected, 6);
    // corner (0,0): in-image pixels (0,0) (1,0) (0,1) (1,1) = 1,0,0,1 → exactly 1 bit
    expect(e.data[0]).toBeCloseTo(1, 6);
  });

  it('a flat image has zero entropy, all distinct levels give log2(N)', () => {
    expect(Math.max(...localEntropy(new Uint8Array(64).fill(77), 8, 8, 5).data)).toBe(0);
    const v = new Uint8Array(9 * 9);
    for (let i = 0; i < v.length; i++) v[i] = i; // 81 distinct levels
    const e = localEntropy(v, 9, 9, 3);
    expect(e.data[4 * 9 + 4]).toBeCloseTo(Math.log2(9), 6);
    expect(e.data[0]).toBeCloseTo(Math.log2(4), 6);
  });

  it('equals a brute-force count on seeded random images, odd sizes and windows (incl. window > image)', () => {
    for (const [W, H, w, levels, seed] of [
      [17, 11, 3, 4, 1],
      [23, 9, 7, 256, 2],
      [10, 13, 15, 8, 3],
      [5, 4, 31, 3, 4],
      [1, 7, 3, 5, 5],
      [9, 1, 5, 5, 6],
    ] as const) {
      const v = seeded(W * H, seed, levels);
      const ours = localEntropy(v, W, H, w).data;
      const ref = bruteEntropy(v, W, H, w);
      let d = 0;
      for (let i = 0; i < ref.length; i++) d = Math.max(d, Math.abs(ours[i] - ref[i]));
      expect(d, `${W}×${H} w=${w}`).toBeLessThan(1e-5);
    }
  });

  it('bins on 8-bit input: floor(v·bins/256)', () => {
    const W = 16;
    const v = new Uint8Array(W * W);
    for (let i = 0; i < v.length; i++) v[i] = i % 256;
    const q = Uint8Array.from(v, (g) => Math.floor((g * 8) / 256));
    expect(Array.from(localEntropy(v, W, W, 5, { bins: 8 }).data)).toEqual(Array.from(localEntropy(q, W, W, 5).data));
  });

  it('a 0..1 raster is quantised over its robust range into 32 bins by default', () => {
    const W = 40;
    const v = seeded(W * W, 9, 256);
    const f = Float32Array.from(v, (g) => g / 255);
    const [lo, hi] = intensityRange(createRaster(W, W, f), [0.5, 99.5]);
    const q = Uint8Array.from(f, (x) => Math.min(31, Math.max(0, Math.floor(((x - lo) / (hi - lo)) * 32))));
    const ours = localEntropy(createRaster(W, W, f), W, W, 7);
    expect(Array.from(ours.data)).toEqual(Array.from(localEntropy(q, W, W, 7).data));
    expect(Math.max(...ours.data)).toBeLessThanOrEqual(5 + 1e-6); // log2(32)
  });

  it('an explicit range saturates values outside it', () => {
    const f = new Float32Array([0, 0.2, 0.4, 0.6, 0.8, 1, 0, 0.2, 0.4]);
    const e = localEntropy(createRaster(3, 3, f), 3, 3, 3, { bins: 2, range: [0.5, 0.6] });
    // bins: <0.5 → 0 (0, .2, .4, 0, .2, .4), ≥ 0.55 → 1 (.6, .8, 1): centre window 6:3
    expect(e.data[4]).toBeCloseTo(-(2 / 3) * Math.log2(2 / 3) - (1 / 3) * Math.log2(1 / 3), 6);
  });

  it('a flat 0..1 raster gives zero entropy', () => {
    const e = localEntropy(createRaster(6, 6, new Float32Array(36).fill(0.3)), 6, 6, 3);
    expect(Math.max(...e.data)).toBe(0);
  });
});

describe('intensityRange', () => {
  it('percentiles of a uniform ramp within one histogram bin', () => {
    const n = 10001;
    const f = Float32Array.from({ length: n }, (_, i) => i / (n - 1));
    const [lo, hi] = intensityRange(createRaster(n, 1, f), [1, 99]);
    expect(lo).toBeCloseTo(0.01, 3);
    expect(hi).toBeCloseTo(0.99, 3);
  });
});

describe('localEntropy refuses bad input', () => {
  const v = new Uint8Array(16);
  it.each([
    ['even window', () => localEntropy(v, 4, 4, 4), 'BAD_PARAMETER'],
    ['window 1', () => localEntropy(v, 4, 4, 1), 'BAD_PARAMETER'],
    ['size mismatch', () => localEntropy(v, 5, 4, 3), 'BAD_PARAMETER'],
    ['raster size mismatch', () => localEntropy(createRaster(4, 4), 4, 3, 3), 'BAD_PARAMETER'],
    ['1 bin', () => localEntropy(v, 4, 4, 3, { bins: 1 }), 'BAD_PARAMETER'],
    ['257 bins', () => localEntropy(v, 4, 4, 3, { bins: 257 }), 'BAD_PARAMETER'],
    ['reversed range', () => localEntropy(createRaster(4, 4), 4, 4, 3, { range: [1, 0] }), 'BAD_PARAMETER'],
    ['bad percentiles', () => localEntropy(createRaster(4, 4), 4, 4, 3, { percentiles: [50, 10] }), 'BAD_PARAMETER'],
    ['NaN pixel', () => localEntropy(createRaster(2, 2, new Float32Array([0, NaN, 1, 0.5])), 2, 2, 3), 'PROCESSING_FAILED'],
  ])('%s', (_n, f, code) => {
    expect(codeOf(f)).toBe(code);
  });
});
