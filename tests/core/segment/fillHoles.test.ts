/** fillHoles (scan-line flood fill) against a plain pixel-by-pixel 4-connected flood fill. */
import { describe, expect, it } from 'vitest';
import { fillHoles } from '../../../src/core/segment/cvutil.js';
import { createMask } from '../../../src/core/image/raster.js';

/** Reference: breadth-first flood of the background from every frame pixel, 4-neighbours. */
function reference(data: Uint8Array, W: number, H: number): Uint8Array {
  const out = Uint8Array.from(data);
  const seen = new Uint8Array(W * H);
  const q: number[] = [];
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) if ((x === 0 || y === 0 || x === W - 1 || y === H - 1) && !data[y * W + x]) { seen[y * W + x] = 1; q.push(y * W + x); }
  for (let h = 0; h < q.length; h++) {
    const i = q[h];
    const x = i % W;
    const y = (i - x) / W;
    for (const [nx, ny] of [[x - 1, y], [x + 1, y], [x, y - 1], [x, y + 1]]) {
      if (nx < 0 || ny < 0 || nx >= W || ny >= H) continue;
      const j = ny * W + nx;
      if (!data[j] && !seen[j]) {
        seen[j] = 1;
        q.push(j);
      }
    }
  }
  for (let i = 0; i < out.length; i++) if (!data[i] && !seen[i]) out[i] = 1;
  return out;
}

describe('fillHoles', () => {
  for (const [W, H, p, seed] of [[60, 40, 0.45, 1], [33, 71, 0.55, 2], [90, 90, 0.6, 3], [1, 9, 0.5, 4], [7, 1, 0.5, 5]] as const) {
    it(`equals a plain flood fill on a random ${W}×${H} mask (density ${p})`, () => {
      let s = seed * 7919;
      const m = createMask(W, H);
      for (let i = 0; i < m.data.length; i++) {
        s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
        m.data[i] = s / 2 ** 32 < p ? 1 : 0;
      }
      const ref = reference(m.data, W, H);
      fillHoles(m);
      expect(Array.from(m.data)).toEqual(Array.from(ref));
    });
  }
  it('fills a ring interior, also a hole touching a concave pocket, but not an open bay', () => {
    const W = 20;
    const H = 12;
    const m = createMask(W, H);
    for (let y = 2; y <= 9; y++) for (let x = 2; x <= 17; x++) if (y === 2 || y === 9 || x === 2 || x === 17) m.data[y * W + x] = 1;
    m.data[2 * W + 10] = 0; // bay: opening in the top edge of the ring
    const before = Uint8Array.from(m.data);
    fillHoles(m);
    expect(Array.from(m.data)).toEqual(Array.from(reference(before, W, H)));
    expect(m.data[5 * W + 5]).toBe(0); // connected to the outside through the opening
  });
});

describe('fillHoles on the bounding box (exact shortcut)', () => {
  // masks that do not reach every side of the frame: the flood runs on their box grown by 1 px only
  for (const [W, H, bx0, by0, bx1, by1, p, seed] of [
    [80, 60, 10, 12, 50, 40, 0.55, 11], // inside, away from the frame
    [80, 60, 0, 5, 40, 59, 0.6, 12], // touching the left and bottom frame
    [70, 50, 1, 1, 68, 48, 0.5, 13], // box grown by 1 is the whole image
    [64, 64, 30, 0, 63, 20, 0.65, 14], // a corner
    [50, 40, 20, 20, 20, 20, 1, 15], // one pixel
  ] as const) {
    it(`equals a plain flood fill on a ${W}×${H} mask set in [${bx0}, ${bx1}] × [${by0}, ${by1}]`, () => {
      let s = seed * 7919;
      const m = createMask(W, H);
      for (let y = by0; y <= by1; y++) {
        for (let x = bx0; x <= bx1; x++) {
          s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
          m.data[y * W + x] = s / 2 ** 32 < p ? 1 : 0;
        }
      }
      // a closed ring with a hole inside the region, so something is filled
      const cx = (bx0 + bx1) >> 1;
      const cy = (by0 + by1) >> 1;
      for (let y = cy - 3; y <= cy + 3; y++) for (let x = cx - 3; x <= cx + 3; x++) {
        if (x < bx0 || x > bx1 || y < by0 || y > by1) continue;
        m.data[y * W + x] = Math.max(Math.abs(x - cx), Math.abs(y - cy)) === 3 ? 1 : 0;
      }
      const ref = reference(m.data, W, H);
      fillHoles(m);
      expect(Array.from(m.data)).toEqual(Array.from(ref));
    });
  }
  it('leaves an empty mask empty', () => {
    const m = createMask(9, 7);
    fillHoles(m);
    expect(Array.from(m.data).every((v) => v === 0)).toBe(true);
  });
});

describe('setBox', () => {
  it('equals the plain bounding box of the set pixels', async () => {
    const { setBox } = await import('../../../src/core/segment/cvutil.js');
    let s = 99;
    for (let t = 0; t < 200; t++) {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      const W = 1 + (s % 23);
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      const H = 1 + (s % 17);
      const o = new Uint8Array(W * H);
      const k = t % 6; // a few set pixels, values other than 1 too
      for (let j = 0; j < k; j++) {
        s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
        o[s % o.length] = 1 + (j % 3) * 127;
      }
      let box: { x0: number; y0: number; x1: number; y1: number } | null = null;
      for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
        if (!o[y * W + x]) continue;
        box = box ? { x0: Math.min(box.x0, x), y0: Math.min(box.y0, y), x1: Math.max(box.x1, x), y1: Math.max(box.y1, y) } : { x0: x, y0: y, x1: x, y1: y };
      }
      expect(setBox(o, W, H)).toEqual(box);
    }
  });
});
