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
