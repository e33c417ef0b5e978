import { describe, expect, it } from 'vitest';
import { createRng, percentileSorted } from '../../../src/core/random.js';
import { criticalDistance, criticalDistanceUncertainty } from '../../../src/core/tcd/index.js';
import { ref } from './fixtures.js';

describe('random.ts (mulberry32 + Box–Muller)', () => {
  it('fixed stream: matches an independent Python mulberry32 (scripts/fixtures/tcd_reference.py)', () => {
    const a = createRng(1);
    for (const v of ref.mulberry32_seed1) expect(a.nextFloat()).toBe(v);
    const b = createRng(123456789);
    for (const v of ref.mulberry32_seed123456789) expect(b.nextFloat()).toBe(v);
  });
  it('normal variates have mean ≈ 0 and sd ≈ 1', () => {
    const r = createRng(7);
    let s = 0;
    let s2 = 0;
    const n = 50000;
    for (let i = 0; i < n; i++) {
      const v = r.normal();
      s += v;
      s2 += v * v;
    }
    expect(Math.abs(s / n)).toBeLessThan(0.02);
    expect(Math.sqrt(s2 / n)).toBeCloseTo(1, 1);
  });
  it('percentile (type 7) matches numpy.percentile', () => {
    const sorted = [...ref.percentile.data].sort((x, y) => x - y);
    expect(percentileSorted(sorted, 2.5)).toBeCloseTo(ref.percentile.p2_5, 12);
    expect(percentileSorted(sorted, 50)).toBeCloseTo(ref.percentile.p50, 12);
    expect(percentileSorted(sorted, 97.5)).toBeCloseTo(ref.percentile.p97_5, 12);
  });
});

describe('criticalDistanceUncertainty', () => {
  it('small scatter (1 % sd): MC half-width within 3 % of the first-order half-width 1.96·2·√2 %·L (delta method)', () => {
    const u = criticalDistanceUncertainty({ mean: 60, sd: 0.6 }, { mean: 900, sd: 9 }, { seed: 42 });
    const L = criticalDistance(60, 900).L_um;
    const analyticHalf = 1.959963984540054 * 2 * Math.sqrt(0.01 ** 2 + 0.01 ** 2) * L;
    const mcHalf = (u.interval95_um[1] - u.interval95_um[0]) / 2;
    expect(Math.abs(mcHalf / analyticHalf - 1)).toBeLessThan(0.03);
    expect(u.deltaInterval95_um[1] - L).toBeCloseTo(analyticHalf, 6);
    expect(u.median_um / L).toBeCloseTo(1, 2);
  });
  it('is reproducible bit for bit for a seed and differs for another seed', () => {
    const a = criticalDistanceUncertainty({ mean: 60, sd: 3 }, { mean: 900, sd: 40 }, { seed: 5 });
    const b = criticalDistanceUncertainty({ mean: 60, sd: 3 }, { mean: 900, sd: 40 }, { seed: 5 });
    const c = criticalDistanceUncertainty({ mean: 60, sd: 3 }, { mean: 900, sd: 40 }, { seed: 6 });
    expect(a.interval95_um).toEqual(b.interval95_um);
    expect(c.interval95_um[0]).not.toBe(a.interval95_um[0]);
    expect(a.draws).toBe(20000);
  });
  it('large scatter: the MC interval is skewed upwards (L ∝ K²/σ²), unlike the symmetric first-order one', () => {
    const u = criticalDistanceUncertainty({ mean: 60, sd: 9 }, { mean: 900, sd: 135 }, { seed: 1 });
    expect(u.interval95_um[1] - u.median_um).toBeGreaterThan(u.median_um - u.interval95_um[0]);
    expect(u.interval95_um[0]).toBeGreaterThan(0);
  });
  it('uniform intervals: all draws inside [L(Kmin,σmax), L(Kmax,σmin)]', () => {
    const u = criticalDistanceUncertainty({ lo: 55, hi: 65 }, { lo: 850, hi: 950 }, { seed: 3, draws: 5000 });
    expect(u.interval95_um[0]).toBeGreaterThan(criticalDistance(55, 950).L_um);
    expect(u.interval95_um[1]).toBeLessThan(criticalDistance(65, 850).L_um);
  });
  it('refuses bad scatter and draw counts', () => {
    expect(() => criticalDistanceUncertainty({ mean: 60, sd: -1 }, { mean: 900, sd: 1 })).toThrow(/standard deviation/);
    expect(() => criticalDistanceUncertainty({ lo: 70, hi: 60 }, { mean: 900, sd: 1 })).toThrow(/interval/);
    expect(() => criticalDistanceUncertainty({ mean: 60, sd: 1 }, { mean: 900, sd: 1 }, { draws: 10 })).toThrow(/draws/);
  });
});
