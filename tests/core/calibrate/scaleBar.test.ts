/**
 * Scale-bar detection on drawn scenes. Truth comes from the drawing (bars drawn with exact area
 * coverage, so the true edge-to-edge length is b − a px), not from the code under test.
 * Bound: |lengthPx − truth| ≤ 0.5 px on clean drawings, ≤ 1 px with blur / noise / JPEG.
 */
import { describe, expect, it } from 'vitest';
import { detectScaleBar, DEFAULT_MIN_CONFIDENCE } from '../../../src/core/calibrate/index.js';
import type { GrayRaster } from '../../../src/core/image/raster.js';
import * as D from '../../helpers/drawBar.js';
import { barConfidence, CONFIDENCE_FACTORS, type ConfidenceInputs } from '../../../src/core/calibrate/scaleBarRefine.js';

const W = 640;
const H = 480;

type Corner = 'tl' | 'tr' | 'bl' | 'br';

interface Case {
  name: string;
  make: () => { r: GrayRaster; truth: number; across: number; thickness: number; vertical?: boolean; polarity: 'light' | 'dark' };
  tol: number;
}

function cornerBar(corner: Corner, polarity: 'light' | 'dark', opts: { t?: number; len?: number; label?: boolean; plate?: boolean; seed: number }) {
  const t = opts.t ?? 5;
  const len = opts.len ?? 150.4;
  const bg = polarity === 'light' ? 0.08 : 0.92;
  const r = D.opticalScene(W, H, opts.seed, bg);
  const ink = polarity === 'light' ? 0.96 : 0.03;
  const left = corner.endsWith('l');
  const topC = corner.startsWith('t');
  const a = left ? 30.3 : W - 30.6 - len;
  const across = topC ? 40 + 0.5 : H - 40 - t;
  if (opts.plate) {
    // plate of opposite brightness, bar ink as usual: here a mid-gray plate around bar + label
    D.fillRect(D.blank(1, 1, 0), 0, 0, 1, 1, 0); // no-op keeps types simple
    D.fillRect(r, a - 12, across - 34, a + len + 12, across + t + 14, polarity === 'light' ? 0.25 : 0.75);
  }
  if (opts.label) D.drawLabel(r, a + len / 2 - 40, across - 26, 16, ink, 6, opts.seed);
  const truth = D.drawBar(r, { a, b: a + len, across, thickness: t, value: ink });
  return { r, truth, across, thickness: t, polarity };
}

const cases: Case[] = [];
let seed = 100;
for (const corner of ['tl', 'tr', 'bl', 'br'] as Corner[]) {
  for (const polarity of ['light', 'dark'] as const) {
    const s = seed++;
    cases.push({ name: `${corner} ${polarity} plain`, make: () => cornerBar(corner, polarity, { seed: s }), tol: 0.5 });
    const s2 = seed++;
    cases.push({ name: `${corner} ${polarity} label`, make: () => cornerBar(corner, polarity, { seed: s2, label: true }), tol: 0.5 });
  }
}
for (const t of [2, 3, 8, 14, 20]) {
  const s = seed++;
  cases.push({ name: `thickness ${t} px`, make: () => cornerBar('br', 'light', { seed: s, t, len: 30 * t > 300 ? 300.7 : Math.max(90.2, 25 * t + 0.7) }), tol: 0.5 });
}
for (const len of [40.5, 97.25, 333.6]) {
  const s = seed++;
  cases.push({ name: `length ${len} px`, make: () => cornerBar('bl', 'dark', { seed: s, t: 4, len }), tol: 0.5 });
}
cases.push({ name: 'light plate + label', make: () => cornerBar('br', 'light', { seed: seed++, plate: true, label: true }), tol: 0.5 });
cases.push({ name: 'dark plate + label', make: () => cornerBar('tl', 'dark', { seed: seed++, plate: true, label: true }), tol: 0.5 });
cases.push({
  name: 'dark bar on white plate on dark background',
  make: () => {
    const r = D.opticalScene(W, H, 300);
    D.fillRect(r, 440, 380, 620, 465, 0.97);
    D.drawLabel(r, 470, 392, 18, 0.03, 6, 3);
    const truth = D.drawBar(r, { a: 460.25, b: 600.5, across: 430, thickness: 7, value: 0.03 });
    return { r, truth, across: 430, thickness: 7, polarity: 'dark' as const };
  },
  tol: 0.5,
});
cases.push({
  name: 'SEM data strip',
  make: () => {
    const r = D.opticalScene(W, H, 301, 0.3);
    D.fillRect(r, -1, 420, W + 1, H + 1, 0.02);
    D.drawLabel(r, 30, 435, 16, 0.95, 9, 4);
    D.drawLabel(r, 500, 432, 12, 0.95, 5, 5);
    const truth = D.drawBar(r, { a: 380.5, b: 590.2, across: 452, thickness: 5, value: 0.95 });
    return { r, truth, across: 452, thickness: 5, polarity: 'light' as const };
  },
  tol: 0.5,
});
cases.push({
  name: 'vertical bar, left margin',
  make: () => {
    const r = D.opticalScene(W, H, 302);
    const truth = D.drawBar(r, { a: 120.4, b: 320.1, across: 25, thickness: 4, value: 0.95, vertical: true });
    return { r, truth, across: 25, thickness: 4, vertical: true, polarity: 'light' as const };
  },
  tol: 0.5,
});
cases.push({
  name: 'vertical dark bar with label, right margin',
  make: () => {
    const r = D.opticalScene(W, H, 303, 0.9);
    D.drawLabel(r, 560, 60, 12, 0.03, 4, 6);
    const truth = D.drawBar(r, { a: 90.6, b: 250.6, across: 600.5, thickness: 6, value: 0.03, vertical: true });
    return { r, truth, across: 600.5, thickness: 6, vertical: true, polarity: 'dark' as const };
  },
  tol: 0.5,
});
cases.push({
  name: 'end caps |———| (length between outer cap edges)',
  make: () => {
    const r = D.opticalScene(W, H, 304);
    const truth = D.drawBar(r, { a: 440, b: 600.5, across: 440, thickness: 3, value: 0.95, capHeight: 15 });
    return { r, truth, across: 440, thickness: 3, polarity: 'light' as const };
  },
  tol: 0.5,
});
cases.push({
  name: 'blur + noise, 2 px bar',
  make: () => {
    const o = cornerBar('tr', 'light', { seed: 305, t: 2, len: 120.3, label: true });
    D.boxBlur(o.r, 1, 2);
    D.addNoise(o.r, 0.03, 11);
    return o;
  },
  tol: 1,
});
cases.push({
  name: 'blur + noise, dark 10 px bar',
  make: () => {
    const o = cornerBar('bl', 'dark', { seed: 306, t: 10, len: 260.8 });
    D.boxBlur(o.r, 2, 2);
    D.addNoise(o.r, 0.04, 12);
    return o;
  },
  tol: 1,
});
for (const q of [60, 85]) {
  cases.push({
    name: `JPEG quality ${q} (ringing, blocks)`,
    make: () => {
      const o = cornerBar('br', 'light', { seed: 307 + q, t: 4, len: 170.3, label: true });
      return { ...o, r: D.jpegRoundTrip(o.r, q) };
    },
    tol: 1,
  });
}

describe('detectScaleBar: bars are found and measured', () => {
  it.each(cases.map((c) => [c.name, c] as const))('%s', (_n, c) => {
    const { r, truth, across, thickness, vertical, polarity } = c.make();
    const bar = detectScaleBar(r);
    expect(bar, 'bar found').not.toBeNull();
    if (!bar) return;
    expect(Math.abs(bar.lengthPx - truth)).toBeLessThanOrEqual(c.tol);
    expect(bar.orientation).toBe(vertical ? 'vertical' : 'horizontal');
    expect(bar.polarity).toBe(polarity);
    expect(bar.confidence).toBeGreaterThanOrEqual(DEFAULT_MIN_CONFIDENCE);
    expect(bar.confidence).toBeLessThanOrEqual(1);
    // midline within 1 px of the drawn one; end points consistent with the length
    const mid = across + thickness / 2 - 0.5; // pixel-centre coordinate of the drawn midline
    if (vertical) {
      expect(Math.abs(bar.x0 - mid)).toBeLessThanOrEqual(1);
      expect(bar.y1 - bar.y0 + 1).toBeCloseTo(bar.lengthPx, 6);
    } else {
      expect(Math.abs(bar.y0 - mid)).toBeLessThanOrEqual(1);
      expect(bar.x1 - bar.x0 + 1).toBeCloseTo(bar.lengthPx, 6);
    }
  });

  it('reports the plate and the label when present', () => {
    const r = D.opticalScene(W, H, 400);
    D.fillRect(r, 440, 380, 620, 465, 0.97);
    D.drawLabel(r, 470, 392, 18, 0.03, 6, 3);
    D.drawBar(r, { a: 460.25, b: 600.5, across: 430, thickness: 7, value: 0.03 });
    const bar = detectScaleBar(r);
    expect(bar?.plate).toBeDefined();
    expect(bar?.labelBox).toBeDefined();
    const p = bar!.plate!;
    // drawn plate spans x 440..620, y 380..465 (continuous); allow 3 px
    expect(Math.abs(p.x - 440)).toBeLessThanOrEqual(3);
    expect(Math.abs(p.x + p.w - 620)).toBeLessThanOrEqual(3);
    expect(Math.abs(p.y - 380)).toBeLessThanOrEqual(3);
    expect(Math.abs(p.y + p.h - 465)).toBeLessThanOrEqual(3);
    const l = bar!.labelBox!;
    expect(l.y + l.h).toBeLessThanOrEqual(431); // label lies above the bar
  });
});

describe('detectScaleBar: no bar → null', () => {
  it('plain textured scene', () => {
    expect(detectScaleBar(D.opticalScene(W, H, 500))).toBeNull();
    expect(detectScaleBar(D.opticalScene(W, H, 501, 0.9))).toBeNull();
  });
  it('long wavy ridges and cracks through the texture', () => {
    const r = D.opticalScene(W, H, 502);
    D.drawRidge(r, 200, 450, 230, 0.02, 1);
    D.drawRidge(r, 180, 460, 300, 0.98, 2);
    D.drawRidge(r, 150, 380, 330, 0.02, 3, true);
    expect(detectScaleBar(r)).toBeNull();
  });
  it('straight specimen edge (flat plate specimen filling the lower part)', () => {
    const r = D.blank(W, H, 0.08);
    D.textureDisc(r, W / 2, H * 4, H * 3.6, 503); // edge nearly straight across the frame
    expect(detectScaleBar(r)).toBeNull();
    const r2 = D.blank(W, H, 0.08);
    D.fillRect(r2, -1, 250, W + 1, H + 1, 0.6); // an exactly straight, uniform edge
    D.textureDisc(r2, W / 2, 480, 200, 504);
    expect(detectScaleBar(r2)).toBeNull();
  });
  it('a bright line running frame to frame (strip border) is not a bar', () => {
    const r = D.opticalScene(W, H, 505);
    D.fillRect(r, -1, 440, W + 1, 444, 0.95);
    expect(detectScaleBar(r)).toBeNull();
  });
  it('a bar cut by the image frame is refused rather than mis-measured', () => {
    const r = D.opticalScene(W, H, 506);
    D.drawBar(r, { a: -10, b: 150, across: 440, thickness: 5, value: 0.95 });
    expect(detectScaleBar(r)).toBeNull();
  });
  it('uniform image and tiny image', () => {
    expect(detectScaleBar(D.blank(W, H, 0.5))).toBeNull();
    expect(detectScaleBar(D.blank(10, 10, 0.5))).toBeNull();
  });
  it('rejects inconsistent options', () => {
    expect(() => detectScaleBar(D.blank(W, H, 0.5), { minThicknessPx: 10, maxThicknessPx: 5 })).toThrow(/inconsistent/);
  });
});

describe('detectScaleBar: reduced-resolution search', () => {
  it('finds and measures a 2 px bar in a large image searched at reduced resolution', () => {
    const w = 2400;
    const h = 1800; // 4.3 MP → reduction factor 2 with the default budget
    const r = D.blank(w, h, 0.08);
    D.textureDisc(r, w / 2, h / 2, 600, 600, 0.55, 0.25);
    const truth = D.drawBar(r, { a: 1900.3, b: 2250.9, across: 1700, thickness: 2, value: 0.95 });
    const bar = detectScaleBar(r);
    expect(bar).not.toBeNull();
    expect(Math.abs(bar!.lengthPx - truth)).toBeLessThanOrEqual(0.5);
  });
});

describe('scale-bar confidence factors (scaleBarRefine.ts)', () => {
  const ideal: ConfidenceInputs = { contrast: 0.5, cA: 0.5, cB: 0.5, edgeStd: 0.1, edgeOutliers: 0, uni: 0.02, sur: 0.05, endW: 2, margin: 0.05, hasLabel: true };
  it('an ideal bar scores 1 on every factor; each factor is named and lies in 0..1', () => {
    expect(CONFIDENCE_FACTORS.map((f) => f.name)).toEqual(['contrast', 'two-sided', 'straight', 'uniform', 'quiet surroundings', 'sharp ends', 'position', 'label']);
    for (const f of CONFIDENCE_FACTORS) expect(f.score(ideal), f.name).toBe(1);
    expect(barConfidence(ideal)).toBe(1);
  });
  it('each factor falls (or rises) along its ramp and stays in 0..1', () => {
    const at = (patch: Partial<ConfidenceInputs>): number[] => CONFIDENCE_FACTORS.map((f) => f.score({ ...ideal, ...patch }));
    const byName = (patch: Partial<ConfidenceInputs>): Record<string, number> => Object.fromEntries(CONFIDENCE_FACTORS.map((f, i) => [f.name, at(patch)[i]]));
    expect(byName({ contrast: 0.04, cA: 0.04, cB: 0.04 }).contrast).toBe(0);
    expect(byName({ contrast: 0.1, cA: 0.1, cB: 0.1 }).contrast).toBeCloseTo(0.5, 12);
    expect(byName({ contrast: 0.1, cA: 0.1, cB: 0.4 })['two-sided']).toBeCloseTo(0.5, 12); // one-sided edges score low
    expect(byName({ edgeStd: 1 }).straight).toBe(0);
    expect(byName({ endW: NaN })['sharp ends']).toBe(0);
    expect(byName({ margin: 0.5 }).position).toBeCloseTo(0.7, 12);
    expect(byName({ hasLabel: false }).label).toBe(0.9);
    for (const v of [...at({ contrast: -1 }), ...at({ uni: 9, sur: 9, edgeOutliers: 1 })]) expect(v >= 0 && v <= 1).toBe(true);
  });
});
