/** logClampedInto against Math.log (the reference: IEEE-754 double natural log of the JS engine). */
import { describe, expect, it } from 'vitest';
import { logClampedInto } from '../../../src/core/segment/fastLog.js';

describe('logClampedInto', () => {
  it('equals Math.log(max(x, floor)) to 1e-14 relative over 30 decades and at the edge cases', () => {
    const n = 200000;
    const x = new Float32Array(n);
    let s = 12345;
    for (let i = 0; i < n; i++) {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      x[i] = 10 ** (-15 + (30 * s) / 2 ** 32);
    }
    x.set([0, -1, NaN, Infinity, 1, 1e-12, 2, 0.5, 1 - 2 ** -24, 1 + 2 ** -23, 3.4e38, 1e-40], 0);
    for (const floor of [1e-12, 1e-3]) {
      const out = new Float64Array(n);
      logClampedInto(x, floor, out);
      let worst = 0;
      const special: [number, number][] = [];
      for (let i = 0; i < n; i++) {
        const ref = Math.log(Math.max(x[i], floor));
        if (!Number.isFinite(ref)) special.push([out[i], ref]);
        else worst = Math.max(worst, Math.abs(out[i] - ref) / Math.max(1, Math.abs(ref)));
      }
      expect(worst).toBeLessThanOrEqual(1e-14);
      expect(special).toEqual([[NaN, NaN], [Infinity, Infinity]]);
      // stored as float32: the same numbers as a Math.log loop (allow one in 10⁵ to round across)
      const o32 = new Float32Array(n);
      logClampedInto(x, floor, o32);
      let nDiff = 0;
      for (let i = 0; i < n; i++) if (o32[i] !== Math.fround(Math.log(Math.max(x[i], floor))) && !Number.isNaN(o32[i])) nDiff++;
      expect(nDiff).toBeLessThanOrEqual(2);
    }
  });
});
