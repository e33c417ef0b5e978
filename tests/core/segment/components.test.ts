/**
 * keepLabelled (segment/components.ts, issue 16: the coarse foreground labelled once for
 * listSpecimens and findSpecimen) against cvutil's keepComponent on the same masks.
 */
import { describe, expect, it } from 'vitest';
import { keepComponent, keepLabelled, labelledComponents } from '../../../src/core/segment/components.js';
import { createMask } from '../../../src/core/image/raster.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

describe('keepLabelled', () => {
  it('keeps the component keepComponent keeps (target on a large piece, a small piece, the background, off the image)', () => {
    let byTarget = 0;
    let byCentroid = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const rnd = lcg(seed * 17);
      const W = 40 + Math.floor(rnd() * 60);
      const H = 40 + Math.floor(rnd() * 60);
      const m = createMask(W, H);
      for (let k = 0; k < 1 + Math.floor(rnd() * 7); k++) {
        const cx = rnd() * W;
        const cy = rnd() * H;
        const r = 1 + rnd() * 0.25 * Math.min(W, H);
        for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) if (Math.hypot(x - cx, y - cy) < r) m.data[y * W + x] = 1;
      }
      for (let i = 0; i < m.data.length; i++) if (rnd() < 0.005) m.data[i] = 1;
      const set = m.data.reduce<number[]>((a, v, i) => (v ? [...a, i] : a), []);
      const on = set.length ? set[Math.floor(rnd() * set.length)] : 0;
      const targets = [{ x: W / 2, y: H / 2 }, { x: rnd() * W, y: rnd() * H }, { x: -3.4, y: H + 2.6 }, { x: 0.5, y: 0.5 }, { x: (on % W) + 0.3, y: Math.floor(on / W) - 0.2 }];
      for (const target of targets) {
        for (const f of [0, 0.25, 0.9]) {
          const ref = keepComponent(m, target, f);
          const got = keepLabelled(m, target, f);
          expect(got === null).toBe(ref === null);
          if (!ref || !got) continue;
          expect(Array.from(got.data)).toEqual(Array.from(ref.data));
          const tx = Math.min(W - 1, Math.max(0, Math.round(target.x)));
          const ty = Math.min(H - 1, Math.max(0, Math.round(target.y)));
          if (ref.data[ty * W + tx]) byTarget++;
          else byCentroid++;
        }
      }
    }
    expect(byTarget).toBeGreaterThan(10);
    expect(byCentroid).toBeGreaterThan(10);
  });

  it('labels a mask once, and an empty mask keeps nothing', () => {
    expect(keepLabelled(createMask(10, 8), { x: 5, y: 4 })).toBeNull();
    const m = createMask(10, 8);
    m.data[3 * 10 + 4] = 1;
    const a = labelledComponents(m);
    expect(a.n).toBe(2);
    expect(labelledComponents(m)).toBe(a);
  });
});
