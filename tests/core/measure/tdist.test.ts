import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { studentTCdf, studentTInv } from '../../../src/core/measure/index.js';

// Reference values produced by scripts/fixtures/measure_tdist.py (scipy.stats.t.ppf / t.cdf).
const fx = JSON.parse(readFileSync(new URL('../../fixtures/measure/t_ppf.json', import.meta.url), 'utf8')) as {
  ppf: { p: number; df: number; t: number }[];
  cdf: { t: number; df: number; cdf: number }[];
};

describe('Student t quantiles', () => {
  it('match scipy.stats.t.ppf, including fractional df', () => {
    for (const r of fx.ppf) {
      expect(Math.abs(studentTInv(r.p, r.df) - r.t)).toBeLessThan(1e-8 * Math.max(1, Math.abs(r.t)) * 5);
    }
  });
  it('CDF matches scipy.stats.t.cdf', () => {
    for (const r of fx.cdf) expect(studentTCdf(r.t, r.df)).toBeCloseTo(r.cdf, 10);
  });
  it('matches handbook table values', () => {
    // Abramowitz & Stegun, Table 26.10 (t distribution): t_0.975(10) = 2.228, t_0.975(1) = 12.706
    expect(studentTInv(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTInv(0.975, 1)).toBeCloseTo(12.706, 3);
  });
  it('rejects impossible arguments with NaN', () => {
    expect(studentTInv(0, 5)).toBeNaN();
    expect(studentTInv(0.5, -1)).toBeNaN();
  });
});
