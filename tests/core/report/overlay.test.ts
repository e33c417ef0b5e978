/**
 * The overlay's caption band: the label is written above the picture, never over it, so the top of
 * the outline and a scale bar the photograph carries in its corner stay visible.
 */
import { describe, expect, it } from 'vitest';
import { renderOverlay } from '../../../src/core/report/overlay.js';

/** A 400 × 300 gray ramp (value = x / 399) with an outline near the top edge. */
function input(label: string[]) {
  const width = 400;
  const height = 300;
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = x / (width - 1);
  const center = { x: 200, y: 150 };
  const outer = Array.from({ length: 72 }, (_, i) => {
    const t = (i * 5 * Math.PI) / 180;
    return { x: center.x + 140 * Math.cos(t), y: center.y - 140 * Math.sin(t) };
  });
  return { raster: { width, height, data }, umPerPx: 5, center, outer, boundary: null, rays: [], label, maxSidePx: 1600 };
}

describe('overlay caption band', () => {
  const label = ['sample.png', 'quality: ok', 'band width mean 400.0 um'];
  const img = renderOverlay(input(label));
  const band = img.height - 300;
  const px = (x: number, y: number): number[] => [...img.data.subarray((y * img.width + x) * 4, (y * img.width + x) * 4 + 3)];

  it('adds a band as tall as the label above the image, which keeps its own size', () => {
    expect(img.width).toBe(400);
    // one line of 9 px per label line plus 6 px of margin at text size 1 (300 px / 400 → size 1)
    expect(band).toBe(label.length * 9 + 6);
    expect(renderOverlay(input([])).height).toBe(300);
  });

  it('writes the label in the band and leaves the picture under it untouched', () => {
    let lit = 0;
    for (let y = 0; y < band; y++) for (let x = 0; x < 200; x++) if (px(x, y)[0] > 128) lit++;
    expect(lit).toBeGreaterThan(50); // text pixels
    // the image's top-left corner (where a photograph's own bar often sits) is the plain ramp
    for (const x of [0, 40, 120, 180]) expect(px(x, band + 2)).toEqual(Array(3).fill(Math.round((x / 399) * 255)));
  });

  it('draws the outline below the band, where the image is', () => {
    // the outline's top at y = 10 image px: sky-blue pixels within 2 px of band + 10 around x = 200
    let blue = 0;
    for (let y = band + 8; y <= band + 12; y++) for (let x = 195; x <= 205; x++) {
      const [r, g, b] = px(x, y);
      if (b > 200 && r < 150 && g > 150) blue++;
    }
    expect(blue).toBeGreaterThan(0);
  });
});
