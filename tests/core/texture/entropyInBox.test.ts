/**
 * localEntropyInBox: inside the box the same values, bit for bit, as the entropy of the whole raster
 * (the crop keeps every window's pixels and the fixed-point tables; kernels/entropyKernel.ts); 0 outside.
 */
import { describe, expect, it } from 'vitest';
import { createRaster } from '../../../src/core/image/raster.js';
import { localEntropy, localEntropyInBox } from '../../../src/core/texture/index.js';
import { seeded } from './fixtures.js';

describe('localEntropyInBox', () => {
  const W = 90;
  const H = 70;
  const v = seeded(W * H, 17, 200);
  // a smooth left half and a rough right half, so the maps are not flat
  const raster = createRaster(W, H, Float32Array.from(v, (g, i) => ((i % W) < W / 2 ? 0.5 + g / 4000 : g / 255)));
  for (const [win, box] of [
    [9, { x0: 20, y0: 15, x1: 60, y1: 50 }], // inside, away from the frame
    [15, { x0: -3, y0: 0, x1: 30, y1: 69 }], // touching the frame
    [21, { x0: 40, y0: 30, x1: 42, y1: 31 }], // smaller than the window: the crop is grown
    [71, { x0: 10, y0: 10, x1: 20, y1: 20 }], // the window taller than the image
  ] as const) {
    it(`equals the whole raster's entropy inside ${JSON.stringify(box)} (window ${win} px)`, () => {
      const whole = localEntropy(raster, W, H, win).data;
      const got = localEntropyInBox(raster, win, box).data;
      let inside = 0;
      for (let y = 0; y < H; y++) {
        for (let x = 0; x < W; x++) {
          const i = y * W + x;
          if (x >= box.x0 && x <= box.x1 && y >= box.y0 && y <= box.y1) {
            expect(Object.is(got[i], whole[i]), `(${x}, ${y}): ${got[i]} vs ${whole[i]}`).toBe(true);
            if (whole[i] > 0) inside++;
          } else expect(got[i]).toBe(0);
        }
      }
      expect(inside).toBeGreaterThan(0);
    });
  }
});
