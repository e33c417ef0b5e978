/**
 * The overlay's caption band: the label is written above the picture, never over it, so the top of
 * the outline and a scale bar the photograph carries in its corner stay visible.
 */
import { describe, expect, it } from 'vitest';
import { renderOverlay, wrapCaption } from '../../../src/core/report/overlay.js';

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

  it('wraps a line longer than the image after a comma, so every warning code stays in the picture', () => {
    const codes = ['OUTLINE_AMBIGUOUS', 'OUTLINE_INNER_ROUND_EDGE', 'WEAK_TEXTURE_CONTRAST', 'TEXTURE_OVERLAP', 'WIDTH_SPREAD_INFLATED'];
    const quality = `quality: check (${codes.join(', ')})`; // 121 characters, 400 px hold (400 − 8) / 6 = 65
    const lines = wrapCaption(['a.png', quality], 65);
    expect(lines[0]).toBe('a.png');
    expect(lines.length).toBe(3);
    expect(lines[1]).toBe('quality: check (OUTLINE_AMBIGUOUS, OUTLINE_INNER_ROUND_EDGE,');
    expect(lines[2].startsWith('  WEAK_TEXTURE_CONTRAST, ')).toBe(true);
    for (const l of lines) expect(l.length).toBeLessThanOrEqual(65);
    // nothing lost: the pieces joined give the line back
    expect(lines.slice(1).map((l) => l.trim()).join(' ')).toBe(quality);
    // the band grows by the extra line; no text pixel in the last 3 columns
    const img2 = renderOverlay(input(['a.png', quality]));
    expect(img2.height - 300).toBe(3 * 9 + 6);
    let right = 0;
    for (let y = 0; y < img2.height - 300; y++) for (let x = 397; x < 400; x++) if (img2.data[(y * 400 + x) * 4] > 128) right++;
    expect(right).toBe(0);
  });

  it('cuts a word longer than the line, and leaves short lines alone', () => {
    expect(wrapCaption(['x'.repeat(20)], 8)).toEqual(['xxxxxxxx', '  xxxxxx', '  xxxxxx']);
    expect(wrapCaption(['short line'], 65)).toEqual(['short line']);
  });
});

describe('overlay reduction', () => {
  /** The area mean as written before issue 16: row block sums added into a Float64Array accumulator row. */
  function reference(data: Float32Array, W: number, H: number, outW: number, outH: number): Uint8Array {
    const fx = W / outW;
    const fy = H / outH;
    const out = new Uint8Array(outW * outH);
    const acc = new Float64Array(outW);
    for (let oy = 0; oy < outH; oy++) {
      const y0 = Math.floor(oy * fy);
      const y1 = Math.max(y0 + 1, Math.floor((oy + 1) * fy));
      acc.fill(0);
      for (let y = y0; y < y1; y++) {
        for (let ox = 0; ox < outW; ox++) {
          const x0 = Math.floor(ox * fx);
          const x1 = Math.max(x0 + 1, Math.floor((ox + 1) * fx));
          let s = data[y * W + x0];
          for (let x = x0 + 1; x < x1; x++) s += data[y * W + x];
          acc[ox] += s;
        }
      }
      for (let ox = 0; ox < outW; ox++) {
        const x0 = Math.floor(ox * fx);
        const x1 = Math.max(x0 + 1, Math.floor((ox + 1) * fx));
        out[oy * outW + ox] = Math.max(0, Math.min(255, Math.round((acc[ox] / ((y1 - y0) * (x1 - x0))) * 255)));
      }
    }
    return out;
  }

  for (const [W, H, maxSidePx] of [[401, 301, 160], [250, 180, 250], [333, 97, 100], [64, 200, 37]] as const) {
    it(`is the block mean of the same sums (${W}×${H} → long side ${maxSidePx})`, () => {
      let s = W * 7 + H;
      // 8-bit levels as the decoder gives them, plus a few off-grid values
      const data = Float32Array.from({ length: W * H }, (_, i) => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0), i % 17 === 0 ? (s >>> 8) / 2 ** 24 : (s >>> 24) / 255));
      // no pixel size: no scale bar of our own is drawn, the picture is the reduction alone
      const img = renderOverlay({ raster: { width: W, height: H, data }, umPerPx: NaN, center: null, outer: null, boundary: null, rays: [], label: [], maxSidePx });
      const ref = reference(data, W, H, img.width, img.height);
      const got = new Uint8Array(img.width * img.height);
      for (let i = 0; i < got.length; i++) got[i] = img.data[4 * i];
      expect(Array.from(got)).toEqual(Array.from(ref));
      expect(img.data[1]).toBe(img.data[0]);
      expect(img.data[3]).toBe(255);
    });
  }
});
