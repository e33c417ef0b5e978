/**
 * The one seeded generator module (src/core/random.ts): both streams are fixed contracts. The expected
 * numbers were recorded from the streams as they were before the two generators were merged into one
 * module (sfc32 from src/core/render/rng.ts and mulberry32 from src/core/random.ts at commit 1c75c14);
 * the sfc32 stream decides the bytes of the committed samples, the mulberry32 stream the published
 * bootstrap and Monte Carlo results.
 */
import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/random.js';

describe('createRng', () => {
  it('sfc32 gives the recorded stream (uniform, normal pair, int, uniform range, fork, fractional seed)', () => {
    const a = createRng(1, 'sfc32');
    const got = [a.nextFloat(), a.nextFloat(), a.nextFloat(), a.normal(), a.normal(), a.int(1000), a.uniform(2, 3), a.fork('core').nextFloat(), createRng(2.5, 'sfc32').nextFloat()];
    const want = [0.4256499295588583, 0.79042171058245, 0.6910148127935827, 1.1107761626357044, -0.24140215488428937, 944, 2.7507600616663694, 0.3440578479785472, 0.7159652658738196];
    expect(got).toEqual(want);
    expect(a.algorithm).toBe('sfc32');
  });

  it('mulberry32 is the default and gives the recorded stream', () => {
    const m = createRng(7);
    expect(m.algorithm).toBe('mulberry32');
    expect(m.seed).toBe(7);
    expect([m.nextFloat(), m.normal(), m.normal(), m.uniform(-1, 1)]).toEqual([0.011704753153026104, 0.35390320258759356, -0.05171249453602224, 0.39805741142481565]);
  });

  it('one interface: both algorithms give uniforms in [0, 1), whole numbers in [0, n) and forks that are reproducible and distinct', () => {
    for (const alg of ['mulberry32', 'sfc32'] as const) {
      const r = createRng(42, alg);
      for (let i = 0; i < 1000; i++) {
        const u = r.nextFloat();
        expect(u >= 0 && u < 1).toBe(true);
        const k = r.int(7);
        expect(Number.isInteger(k) && k >= 0 && k < 7).toBe(true);
      }
      const f1 = createRng(42, alg).fork('x');
      const f2 = createRng(42, alg).fork('x');
      const f3 = createRng(42, alg).fork('y');
      const s1 = [f1.nextFloat(), f1.nextFloat()];
      expect([f2.nextFloat(), f2.nextFloat()]).toEqual(s1);
      expect([f3.nextFloat(), f3.nextFloat()]).not.toEqual(s1);
      expect(f1.algorithm).toBe(alg);
    }
  });

  it('refuses a non-finite seed', () => {
    expect(() => createRng(Number.NaN)).toThrow(RangeError);
    expect(() => createRng(Infinity, 'sfc32')).toThrow(RangeError);
  });
});
