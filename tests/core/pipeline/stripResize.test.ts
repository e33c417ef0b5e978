/**
 * The working copy made in strips (pipeline/stripResize.ts) equals OpenCV's INTER_AREA resize of
 * the whole image (texture/resample.ts `downsample`) value for value: row strips, column strips and
 * the one-call fallback, at the ratios of common camera sizes reduced to the 1200-px working copy
 * (scaled down so that the test stays small: the ratio decides the weights, not the size).
 */
import { describe, expect, it } from 'vitest';
import { createRaster } from '../../../src/core/image/raster.js';
import { downsampleInStrips, stripPlan } from '../../../src/core/pipeline/stripResize.js';
import { downsample } from '../../../src/core/texture/resample.js';

function noise(w: number, h: number, seed: number) {
  const d = new Float32Array(w * h);
  let s = seed >>> 0;
  for (let i = 0; i < d.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    d[i] = (s >>> 24) / 255;
  }
  return createRaster(w, h, d);
}

describe('downsampleInStrips = downsample', () => {
  // [width, height, long side of the reduction, plan]: the ratios of 8000×6000 → 1200×900 (rows
  // 20 → 3), 5472×3648 → 1200×800 (114 → 25), rows 1004 → 200 (period 50), columns 1505 → 240
  // (rows have no short period), neither (one call), an integer factor, portrait
  const cases: [number, number, number, string][] = [
    [800, 600, 120, 'rows'],
    [1368, 912, 300, 'rows'],
    [1504, 1004, 300, 'rows'],
    [1505, 929, 240, 'columns'],
    [3011, 1859, 600, 'whole'],
    [900, 600, 300, 'rows'],
    [600, 800, 120, 'rows'],
  ];
  for (const [w, h, long, plan] of cases) {
    it(`${w}×${h} → long side ${long} (${plan})`, () => {
      const r = noise(w, h, w * 7 + h);
      const factor = Math.max(w, h) / long;
      expect(stripPlan(w, h, factor, 20_000)).toBe(plan);
      const whole = downsample(r, factor);
      const strips = downsampleInStrips(r, factor, 20_000); // small strips: many of them
      expect([strips.width, strips.height]).toEqual([whole.width, whole.height]);
      expect(Buffer.from(strips.data.buffer).equals(Buffer.from(whole.data.buffer))).toBe(true);
    });
  }

  it('small images and factor 1 go through downsample unchanged', () => {
    const r = noise(50, 40, 3);
    expect(downsampleInStrips(r, 1)).toBe(r);
    expect(downsampleInStrips(r, 2.5).data).toEqual(downsample(r, 2.5).data);
  });

  it('the full-size plans of common sensors: 8000×6000 rows, 6016×4016 columns, 7527×4647 one call', () => {
    expect(stripPlan(8000, 6000, 8000 / 1200)).toBe('rows');
    expect(stripPlan(6016, 4016, 6016 / 1200)).toBe('columns');
    expect(stripPlan(7527, 4647, 7527 / 1200)).toBe('whole');
    expect(stripPlan(2000, 1500, 2000 / 1200)).toBe('whole'); // small: one call
  });
});
