/**
 * Scale-bar detection on images from the project's fractograph renderer (src/core/render), whose
 * truth (bar end columns, thickness) is exact by construction. Bound: |lengthPx − truth| ≤ 1 px
 * (blurred / noisy renders), and the bar is reported as the same polarity.
 */
import { describe, expect, it } from 'vitest';
import { detectScaleBar } from '../../../src/core/calibrate/index.js';
import { renderFractograph } from '../../../src/core/render/index.js';

const configs = [
  { name: 'light bar, br corner, plate', o: { seed: 1, scaleBar: { corner: 'br', polarity: 'light', plate: true } } },
  { name: 'dark bar, tl corner, plate', o: { seed: 2, background: 'bright', scaleBar: { corner: 'tl', polarity: 'dark', plate: true } } },
  { name: 'light bar, bl corner, no plate', o: { seed: 3, scaleBar: { corner: 'bl', polarity: 'light', plate: false } } },
  { name: 'thin bar, tr corner, blur + noise', o: { seed: 4, blurSigmaPx: 1, noiseSigma: 0.02, scaleBar: { corner: 'tr', thicknessPx: 3 } } },
] as const;

describe('detectScaleBar on rendered fractographs', () => {
  it.each(configs.map((c) => [c.name, c.o] as const))('%s', (_n, o) => {
    const { raster, truth } = renderFractograph({ widthPx: 800, heightPx: 600, ...(o as object) });
    expect(truth.scaleBar).not.toBeNull();
    const t = truth.scaleBar!;
    const bar = detectScaleBar(raster);
    expect(bar).not.toBeNull();
    expect(Math.abs(bar!.lengthPx - t.lengthPx)).toBeLessThanOrEqual(1);
    expect(Math.abs(bar!.y0 - t.y)).toBeLessThanOrEqual(1);
    expect(bar!.polarity).toBe(t.polarity);
  });

  it('a rendered fractograph without a scale bar gives null', () => {
    const { raster } = renderFractograph({ widthPx: 800, heightPx: 600, seed: 9, scaleBar: null });
    expect(detectScaleBar(raster)).toBeNull();
  });
});
