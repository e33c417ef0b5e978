/**
 * fillHolesInBox (segment/holes.ts, issue 16) against fillHoles on the whole mask.
 */
import { describe, expect, it } from 'vitest';
import { fillHoles } from '../../../src/core/segment/cvutil.js';
import { fillHolesInBox } from '../../../src/core/segment/holes.js';
import { createMask } from '../../../src/core/image/raster.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

describe('fillHolesInBox', () => {
  it('equals fillHoles on the whole mask (rings, nested rings, specks, shapes on the frame, empty and full masks)', () => {
    let filled = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const rnd = lcg(seed * 131);
      const W = 20 + Math.floor(rnd() * 70);
      const H = 20 + Math.floor(rnd() * 70);
      const m = createMask(W, H);
      const n = seed === 1 ? 0 : 1 + Math.floor(rnd() * 6);
      // seeds 2–9 stay inside the image, the others may reach or cross the frame
      const margin = seed < 10 ? 0.25 : -0.1;
      for (let k = 0; k < n; k++) {
        const cx = (margin + (1 - 2 * margin) * rnd()) * W;
        const cy = (margin + (1 - 2 * margin) * rnd()) * H;
        const ro = 2 + rnd() * 0.35 * Math.min(W, H);
        const ri = rnd() < 0.7 ? ro * (0.2 + 0.6 * rnd()) : 0;
        for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
          const d = Math.max(Math.abs(x - cx) * (k % 2 ? 1 : 0.7), Math.abs(y - cy)) * 0.5 + 0.5 * Math.hypot(x - cx, y - cy);
          if (d < ro && d >= ri) m.data[y * W + x] = 1;
        }
      }
      if (seed === 2) m.data.fill(1);
      for (let i = 0; i < m.data.length; i++) if (rnd() < 0.01) m.data[i] = 1;
      const ref = createMask(W, H);
      ref.data.set(m.data);
      fillHoles(ref);
      const before = m.data.reduce((a, v) => a + v, 0);
      fillHolesInBox(m);
      expect(Array.from(m.data)).toEqual(Array.from(ref.data));
      if (ref.data.reduce((a, v) => a + v, 0) > before) filled++;
    }
    expect(filled).toBeGreaterThan(10); // holes were there to fill
  });
});
