import { afterEach, describe, expect, it } from 'vitest';
import { createRaster } from '../../../src/core/image/raster.js';
import { localStd, localVariance } from '../../../src/core/texture/index.js';
import { boxWasmAvailable } from '../../../src/core/texture/kernels/boxMomentsWasm.js';
import { setWasmKernelsEnabled } from '../../../src/core/texture/kernels/wasm.js';

function seededRaster(W: number, H: number, seed: number) {
  let a = seed >>> 0;
  const d = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      a = (Math.imul(a, 1664525) + 1013904223) >>> 0;
      // flat left third (variance exactly 0 or rounding-negative), noisy rest
      d[y * W + x] = x < W / 3 ? 0.25 : 0.5 + 0.3 * Math.sin(x * 0.1) + 0.2 * (a / 4294967296);
    }
  }
  return createRaster(W, H, d);
}

function identical(a: Float32Array, b: Float32Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

describe('local variance / std rows in WebAssembly', () => {
  afterEach(() => setWasmKernelsEnabled(true));

  it('is available in Node (the speed figures in the README depend on it)', () => {
    expect(boxWasmAvailable()).toBe(true);
  });

  it('give output identical to the JavaScript rows (even/odd widths and interiors, window = image)', () => {
    for (const [W, H, w, seed] of [
      [64, 48, 15, 1],
      [301, 77, 15, 2], // odd width: odd interior pixel count
      [300, 76, 3, 3],
      [129, 130, 31, 4],
      [15, 15, 15, 5], // window as large as the image: no interior
      [16, 17, 15, 6], // one interior pixel
      [18, 20, 15, 7], // two interior pixels
      [1001, 40, 25, 8],
    ] as const) {
      const r = seededRaster(W, H, seed);
      for (const f of [localVariance, localStd]) {
        setWasmKernelsEnabled(false);
        const js = f(r, w).data;
        setWasmKernelsEnabled(true);
        const wa = f(r, w).data;
        expect(identical(js, wa), `${f.name} ${W}×${H} w=${w}`).toBe(true);
        expect(Math.max(...wa)).toBeGreaterThan(1e-3);
      }
    }
  });

  it('still reports non-finite input', () => {
    const r = seededRaster(40, 30, 9);
    r.data[17 * 40 + 33] = Number.NaN;
    expect(() => localVariance(r, 7)).toThrow();
    r.data[17 * 40 + 33] = Number.POSITIVE_INFINITY;
    expect(() => localStd(r, 7)).toThrow();
  });
});
