/**
 * fillCoreNotches (segment/coreNotches.ts) against its plain form (a number[] per ray, sorted with a
 * comparator): the same upper quartiles, so the same coarse radii.
 */
import { describe, expect, it } from 'vitest';
import { fillCoreNotches } from '../../../src/core/segment/coreNotches.js';

function plain(c: (number | null)[], o: (number | null)[], W: number): (number | null)[] {
  const n = c.length;
  const h = Math.max(1, Math.round((45 * n) / 360));
  return c.map((ci, i) => {
    if (ci === null) return null;
    const w: number[] = [];
    for (let j = -h; j <= h; j++) {
      const k = (i + j + n) % n;
      const v = c[k];
      const ov = o[k];
      if (v !== null && ov !== null && v < ov - W) w.push(v);
    }
    if (w.length < h) return ci;
    w.sort((a, b) => a - b);
    const q75 = w[Math.floor(0.75 * (w.length - 1))];
    return ci < q75 - Math.max(2 * W, 0.1 * q75) ? q75 : ci;
  });
}

describe('fillCoreNotches', () => {
  it('equals the plain form on ragged outlines with notches, gaps, ties and core at the edge', () => {
    let s = 31337;
    const rnd = (): number => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return s / 2 ** 32;
    };
    let raised = 0;
    for (const n of [360, 120, 7, 1]) {
      for (let t = 0; t < 20; t++) {
        const o: (number | null)[] = [];
        const c: (number | null)[] = [];
        for (let i = 0; i < n; i++) {
          const u = rnd();
          o.push(u < 0.03 ? null : 300 + 10 * rnd());
          const v = u < 0.08 ? null : u < 0.15 ? 120 : u < 0.25 ? 295 + 10 * rnd() : Math.round(200 + 20 * rnd());
          c.push(v);
        }
        const got = fillCoreNotches(c, o, 15);
        const want = plain(c, o, 15);
        expect(got).toEqual(want);
        raised += got.filter((v, i) => v !== c[i]).length;
      }
    }
    expect(raised).toBeGreaterThan(0); // the notches were filled somewhere
  });
});
