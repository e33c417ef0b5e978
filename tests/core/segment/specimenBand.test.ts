/**
 * The silhouette's edge band (segment/specimen.ts `decideBand`, morphologies on the grown bounding
 * box only) against the same decision on the whole image, and the shared σ = 1 smoothing
 * (segment/smooth.ts) against the in-place `cv.GaussianBlur` the band used before (issue 16).
 */
import { describe, expect, it } from 'vitest';
import { getCv } from '../../../src/core/cv.js';
import { fillHoles, outerContour, rectMorph, setBox } from '../../../src/core/segment/cvutil.js';
import { keepComponent } from '../../../src/core/segment/components.js';
import { decideBand, filledKeptInBox, grownBox, outerContourInBox } from '../../../src/core/segment/specimen.js';
import { gaussian1 } from '../../../src/core/segment/smooth.js';
import { createMask, createRaster } from '../../../src/core/image/raster.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

/** The whole-image form the band had before. */
function wholeBand(up: Uint8Array, W: number, H: number, band: number, d: Float32Array, level: number, bright: boolean, ou: Uint8Array | null): Uint8Array {
  const a = rectMorph(up, W, H, band, 'erode');
  const b = rectMorph(up, W, H, band, 'dilate');
  const out = new Uint8Array(W * H);
  for (let i = 0; i < out.length; i++) {
    if (a[i]) out[i] = 1;
    else if (b[i] && !(ou && ou[i])) out[i] = (d[i] > level) !== bright ? 1 : 0;
  }
  return out;
}

describe('decideBand', () => {
  for (const [W, H, band, seed, where] of [
    [90, 70, 6, 1, 'centre'],
    [80, 60, 12, 2, 'corner'], // set pixels on the frame: the grown box is clipped
    [60, 90, 3, 3, 'spots'],
    [40, 30, 25, 4, 'centre'], // band larger than the image
  ] as const) {
    it(`equals the whole-image decision (${W}×${H}, band ${band}, ${where})`, () => {
      const rnd = lcg(seed);
      const up = new Uint8Array(W * H);
      const discs = where === 'spots' ? [[20, 30, 4], [45, 70, 6], [33, 50, 2]] : where === 'corner' ? [[5, 8, 25], [70, 55, 10]] : [[W / 2, H / 2, 0.3 * Math.min(W, H)]];
      for (const [cx, cy, r] of discs) for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) if ((x - cx) ** 2 + (y - cy) ** 2 < r * r) up[y * W + x] = 255;
      const d = Float32Array.from({ length: W * H }, () => rnd());
      const ou = Uint8Array.from({ length: W * H }, () => (rnd() < 0.1 ? 1 : 0));
      for (const bright of [false, true]) {
        for (const others of [null, ou]) {
          const ref = wholeBand(up, W, H, band, d, 0.5, bright, others);
          const out = new Uint8Array(W * H);
          const box = setBox(up, W, H);
          expect(box).not.toBeNull();
          if (box) decideBand(up, W, H, box, band, d, 0.5, bright, others, out);
          expect(Array.from(out)).toEqual(Array.from(ref));
          expect(out.some((v) => v === 1)).toBe(true);
        }
      }
    });
  }
});

describe('gaussian1', () => {
  it('equals an in-place cv.GaussianBlur (σ = 1, reflect-101) of a copy, and is computed once per raster', () => {
    const cv = getCv();
    const rnd = lcg(7);
    const W = 73;
    const H = 41;
    const r = createRaster(W, H, Float32Array.from({ length: W * H }, () => rnd()));
    const m = new cv.Mat(H, W, cv.CV_32F);
    try {
      (m.data32F as Float32Array).set(r.data);
      cv.GaussianBlur(m, m, new cv.Size(0, 0), 1, 1, cv.BORDER_REFLECT_101);
      const g = gaussian1(r);
      expect(Array.from(g)).toEqual(Array.from(m.data32F as Float32Array));
      expect(gaussian1(r)).toBe(g);
    } finally {
      m.delete();
    }
  });
});

describe('one component of a hole-free mask', () => {
  it('has no holes: fillHoles after keepComponent changes nothing (specimen.ts skips it)', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const rnd = lcg(seed * 31);
      const W = 60 + Math.floor(rnd() * 40);
      const H = 50 + Math.floor(rnd() * 40);
      const m = createMask(W, H);
      // rings, discs and specks, some inside others' holes, some touching diagonally or the frame
      for (let n = 0; n < 14; n++) {
        const cx = rnd() * W;
        const cy = rnd() * H;
        const ro = 2 + rnd() * 18;
        const ri = rnd() < 0.5 ? ro * (0.3 + 0.5 * rnd()) : 0;
        for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
          const d = Math.hypot(x - cx, y - cy);
          if (d < ro && d >= ri) m.data[y * W + x] = 1;
        }
      }
      for (let i = 0; i < m.data.length; i++) if (rnd() < 0.03) m.data[i] = 1;
      fillHoles(m);
      for (const target of [{ x: W / 2, y: H / 2 }, { x: 3, y: 3 }, { x: W - 5, y: H / 3 }]) {
        const kept = keepComponent(m, target, 0);
        expect(kept).not.toBeNull();
        if (!kept) continue;
        const again = createMask(W, H);
        again.data.set(kept.data);
        fillHoles(again);
        expect(Array.from(again.data)).toEqual(Array.from(kept.data));
      }
    }
  });
});

describe('filledKeptInBox', () => {
  it('equals fillHoles + keepComponent on the whole mask (crop inside, on the frame, target off the crop or on a small piece)', () => {
    let cropped = 0;
    let whole = 0;
    for (let seed = 1; seed <= 16; seed++) {
      const rnd = lcg(seed * 97);
      const W = 70 + Math.floor(rnd() * 50);
      const H = 60 + Math.floor(rnd() * 50);
      const band = 1 + Math.floor(rnd() * 6);
      // the band's input: a few discs and rings (holes), some near or over the frame
      const up = new Uint8Array(W * H);
      for (let n = 0; n < 1 + (seed % 4); n++) {
        const cx = (seed % 5 === 0 ? 0.05 + 0.9 * rnd() : 0.3 + 0.4 * rnd()) * W;
        const cy = (seed % 5 === 0 ? 0.05 + 0.9 * rnd() : 0.3 + 0.4 * rnd()) * H;
        const ro = 3 + rnd() * 0.3 * Math.min(W, H);
        const ri = rnd() < 0.5 ? ro * (0.2 + 0.5 * rnd()) : 0;
        for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
          const d = Math.hypot(x - cx, y - cy);
          if (d < ro && d >= ri) up[y * W + x] = 255;
        }
      }
      const box = setBox(up, W, H);
      if (!box) continue;
      const d = Float32Array.from({ length: W * H }, () => rnd());
      const out = new Uint8Array(W * H);
      decideBand(up, W, H, box, band, d, 0.5, seed % 2 === 0, null, out);
      const c = grownBox(box, band, W, H);
      const targets = [
        { x: (box.x0 + box.x1) / 2, y: (box.y0 + box.y1) / 2 },
        { x: box.x0 + 0.4, y: box.y0 + 0.6 },
        { x: -20, y: H + 5 }, // off the crop (and the image)
        { x: rnd() * W, y: rnd() * H },
      ];
      for (const target of targets) {
        const ref = createMask(W, H);
        ref.data.set(out);
        fillHoles(ref);
        const refKept = keepComponent(ref, target, 0.25) ?? ref;
        const m = createMask(W, H);
        m.data.set(out);
        const got = filledKeptInBox(m, c, target);
        expect(Array.from(got.data)).toEqual(Array.from(refKept.data));
        const tx = Math.min(W - 1, Math.max(0, Math.round(target.x)));
        const ty = Math.min(H - 1, Math.max(0, Math.round(target.y)));
        if (refKept.data[ty * W + tx]) cropped++;
        else whole++;
      }
    }
    // both ways of deciding were exercised
    expect(cropped).toBeGreaterThan(5);
    expect(whole).toBeGreaterThan(5);
  });

  it('fills the whole mask when a side of the crop inside the image holds set pixels', () => {
    const W = 30;
    const H = 20;
    const m = createMask(W, H);
    // a ring crossing the crop's right side: its hole lies in the crop, its closure outside it
    for (let y = 4; y <= 14; y++) for (let x = 10; x <= 24; x++) if (y === 4 || y === 14 || x === 10 || x === 24) m.data[y * W + x] = 1;
    const ref = createMask(W, H);
    ref.data.set(m.data);
    fillHoles(ref);
    const refKept = keepComponent(ref, { x: 17, y: 9 }, 0.25) ?? ref;
    const got = filledKeptInBox(m, { x0: 5, y0: 2, cw: 15, ch: 15 }, { x: 17, y: 9 });
    expect(Array.from(got.data)).toEqual(Array.from(refKept.data));
    expect(got.data[9 * W + 17]).toBe(1);
  });
});

describe('outerContourInBox', () => {
  it('equals outerContour of the whole mask (one or several shapes, holes, shapes on the frame, empty mask)', () => {
    let traced = 0;
    for (let seed = 1; seed <= 30; seed++) {
      const rnd = lcg(seed * 53);
      const W = 30 + Math.floor(rnd() * 70);
      const H = 30 + Math.floor(rnd() * 70);
      const m = createMask(W, H);
      const margin = seed % 3 === 0 ? -0.1 : 0.2;
      for (let k = 0; k < (seed === 1 ? 0 : 1 + Math.floor(rnd() * 4)); k++) {
        const cx = (margin + (1 - 2 * margin) * rnd()) * W;
        const cy = (margin + (1 - 2 * margin) * rnd()) * H;
        const ro = 2 + rnd() * 0.3 * Math.min(W, H);
        const ri = rnd() < 0.4 ? ro * 0.5 : 0;
        for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
          const d = Math.hypot((x - cx) * (1 + 0.3 * Math.sin(y)), y - cy);
          if (d < ro && d >= ri) m.data[y * W + x] = 1;
        }
      }
      for (let i = 0; i < m.data.length; i++) if (rnd() < 0.003) m.data[i] = 1;
      const ref = outerContour(m);
      const got = outerContourInBox(m);
      expect(got).toEqual(ref);
      if (ref.length > 8) traced++;
    }
    expect(traced).toBeGreaterThan(20);
  });
});
