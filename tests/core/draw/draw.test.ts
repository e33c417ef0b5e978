import { describe, expect, it } from 'vitest';
import {
  createRgbaImage,
  drawCircle,
  drawEllipse,
  drawLine,
  drawPolyline,
  drawText,
  fillDisc,
  fillRect,
  GLYPH_ADVANCE,
  glyphBitmap,
  hasGlyph,
  measureText,
  textCoverage,
} from '../../../src/core/draw/index.js';
import { createRaster } from '../../../src/core/image/raster.js';

const sum = (a: ArrayLike<number>): number => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s;
};

describe('draw on gray rasters', () => {
  it('fillRect covers exactly columns x0..x1 and rows y0..y1', () => {
    const r = createRaster(10, 8);
    fillRect(r, 2, 3, 6, 4, { gray: 1 });
    for (let y = 0; y < 8; y++)
      for (let x = 0; x < 10; x++) expect(r.data[y * 10 + x]).toBe(x >= 2 && x <= 6 && y >= 3 && y <= 4 ? 1 : 0);
  });

  it('alpha blending: 50 % white over black gives 0.5, over 0.5 gives 0.75', () => {
    const r = createRaster(4, 1, new Float32Array([0, 0.5, 0, 0]));
    fillRect(r, 0, 0, 1, 0, { gray: 1, alpha: 0.5 });
    expect(Array.from(r.data)).toEqual([0.5, 0.75, 0, 0]);
  });

  it('anti-aliased line: painted area ≈ length × width (geometry)', () => {
    const r = createRaster(100, 60);
    drawLine(r, 10.3, 20.7, 80.1, 41.2, 3, { gray: 1 });
    const len = Math.hypot(80.1 - 10.3, 41.2 - 20.7);
    // round caps add π·(w/2)² (area of a stadium: L·w + π·w²/4)
    const area = len * 3 + Math.PI * 2.25;
    expect(Math.abs(sum(r.data) - area) / area).toBeLessThan(0.03);
    expect(r.data[Math.round(20.7) * 100 + 10]).toBeGreaterThan(0.9);
  });

  it('polyline joins are not double-painted (coverage never above 1)', () => {
    const r = createRaster(50, 50);
    drawPolyline(r, [{ x: 5, y: 5 }, { x: 40, y: 5 }, { x: 40, y: 40 }], 4, { gray: 0.8, alpha: 0.5 });
    let max = 0;
    for (const v of r.data) max = Math.max(max, v);
    expect(max).toBeCloseTo(0.4, 5);
  });

  it('circle outline: painted area ≈ 2πr·w', () => {
    const r = createRaster(120, 120);
    drawCircle(r, 60.2, 59.6, 40, 2, { gray: 1 });
    const area = 2 * Math.PI * 40 * 2;
    expect(Math.abs(sum(r.data) - area) / area).toBeLessThan(0.03);
    expect(r.data[60 * 120 + 60]).toBe(0);
  });

  it('filled disc: area ≈ πr²', () => {
    const r = createRaster(80, 80);
    fillDisc(r, 40, 40, 25, { gray: 1 });
    expect(Math.abs(sum(r.data) - Math.PI * 625) / (Math.PI * 625)).toBeLessThan(0.01);
  });

  it('ellipse outline: passes through (cx + a·cosφ, cy − a·sinφ) and the b end, angle CCW on screen', () => {
    const r = createRaster(200, 200);
    const phi = 30;
    drawEllipse(r, 100, 100, 60, 25, phi, 2, { gray: 1 });
    const t = (phi * Math.PI) / 180;
    const at = (x: number, y: number) => r.data[Math.round(y) * 200 + Math.round(x)];
    expect(at(100 + 60 * Math.cos(t), 100 - 60 * Math.sin(t))).toBeGreaterThan(0.5);
    expect(at(100 - 25 * Math.sin(t), 100 - 25 * Math.cos(t))).toBeGreaterThan(0.5);
    expect(at(100 + 60 * Math.sin(t), 100 + 60 * Math.cos(t))).toBe(0);
    // perimeter (Ramanujan's approximation) × width ≈ painted area
    const a = 60;
    const b = 25;
    const h = ((a - b) / (a + b)) ** 2;
    const perim = Math.PI * (a + b) * (1 + (3 * h) / (10 + Math.sqrt(4 - 3 * h)));
    expect(Math.abs(sum(r.data) - 2 * perim) / (2 * perim)).toBeLessThan(0.05);
  });
});

describe('bitmap font', () => {
  it('has every character the project needs', () => {
    const need = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz .,-+=:/()%\u00b5\u00b7\u00b1\u221a';
    for (const ch of need) expect(hasGlyph(ch), ch).toBe(true);
    // glyphs are distinct (no copy-paste duplicates), except the intended µ/μ alias
    const seen = new Map<string, string>();
    for (const ch of need) {
      const key = Array.from(glyphBitmap(ch)).join('');
      expect(seen.has(key), `${ch} duplicates ${seen.get(key)}`).toBe(false);
      seen.set(key, ch);
    }
  });

  it('measures and draws text at an integer scale', () => {
    expect(measureText('500 µm', 2)).toEqual({ width: (6 * GLYPH_ADVANCE - 1) * 2, height: 14 });
    const r = createRaster(40, 20);
    drawText(r, 'I', 3, 2, 2, { gray: 1 });
    const g = glyphBitmap('I');
    for (let row = 0; row < 7; row++)
      for (let col = 0; col < 5; col++)
        for (const [dx, dy] of [[0, 0], [1, 1]]) expect(r.data[(2 + row * 2 + dy) * 40 + 3 + col * 2 + dx]).toBe(g[row * 5 + col]);
    const c = textCoverage(40, 20, 'AB', 0, 0, 1);
    expect(c.width).toBe(11);
    expect(sum(c.data)).toBe(sum(glyphBitmap('A')) + sum(glyphBitmap('B')));
  });

  it('unknown characters draw a box; text is clipped at the canvas', () => {
    expect(hasGlyph('\u4e00')).toBe(false);
    expect(sum(glyphBitmap('\u4e00'))).toBe(20);
    const c = textCoverage(8, 8, 'WWWW', 5, 5, 1);
    expect(c.width).toBe(3);
    expect(c.height).toBe(3);
  });
});

describe('draw on RGBA images', () => {
  it('paints colour with alpha and keeps other pixels', () => {
    const img = createRgbaImage(6, 4, [0, 0, 0, 255]);
    fillRect(img, 1, 1, 2, 1, { rgb: [200, 100, 50], alpha: 0.5 });
    const p = (x: number, y: number) => Array.from(img.data.slice((y * 6 + x) * 4, (y * 6 + x) * 4 + 4));
    expect(p(1, 1)).toEqual([100, 50, 25, 255]);
    expect(p(0, 0)).toEqual([0, 0, 0, 255]);
    drawText(img, '1', 0, 0, 1, { gray: 1 });
    expect(p(2, 0)).toEqual([255, 255, 255, 255]); // top of the '1' stem
  });

  it('gray ink from RGB uses Rec. 709 luma on gray rasters', () => {
    const r = createRaster(2, 1);
    fillRect(r, 0, 0, 0, 0, { rgb: [255, 0, 0] });
    expect(r.data[0]).toBeCloseTo(0.2126, 6); // ITU-R BT.709 luma weight of red
  });

  it('refuses bad sizes and widths', () => {
    expect(() => createRgbaImage(0, 3)).toThrow(/positive/);
    const r = createRaster(10, 10);
    expect(() => drawLine(r, 0, 0, 5, 5, 0, { gray: 1 })).toThrow(/width/);
    expect(() => drawEllipse(r, 5, 5, -1, 2, 0, 1, { gray: 1 })).toThrow(/semi-axes/);
    expect(() => fillRect(r, 0, 0, 1, 1, { gray: 1, alpha: 2 })).toThrow(/opacity/);
  });
});
