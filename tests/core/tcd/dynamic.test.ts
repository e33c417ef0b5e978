import { describe, expect, it } from 'vitest';
import { evaluateRateLaw, fitPowerLaw, parseRatePairsCsv, studentTQuantile } from '../../../src/core/tcd/index.js';
import { ref } from './fixtures.js';

describe('fitPowerLaw', () => {
  it('a law made with known (A, B) fits back exactly', () => {
    const A = 1400;
    const B = -0.07;
    const pairs = [1e-4, 1e-2, 1, 50, 3000].map((rate) => ({ rate, value: A * Math.pow(rate, B) }));
    const f = fitPowerLaw(pairs);
    expect(f.A / A).toBeCloseTo(1, 10);
    expect(f.B).toBeCloseTo(B, 12);
    expect(f.r2).toBeCloseTo(1, 12);
    expect(f.n).toBe(5);
    expect(f.seB).toBeLessThan(1e-10);
  });
  it('matches scipy.stats.linregress on ln–ln data (fixture)', () => {
    const g = ref.regression;
    const f = fitPowerLaw(g.rate.map((rate, i) => ({ rate, value: g.L_um[i] })));
    expect(f.B).toBeCloseTo(g.B, 12);
    expect(Math.log(f.A)).toBeCloseTo(g.lnA, 12);
    expect(f.r2).toBeCloseTo(g.r2, 12);
    expect(f.seB as number).toBeCloseTo(g.seB, 12);
    expect(f.seLnA as number).toBeCloseTo(g.seLnA, 12);
  });
  it('two points: exact law, no standard errors', () => {
    const f = fitPowerLaw([
      { rate: 1, value: 1000 },
      { rate: 100, value: 800 },
    ]);
    expect(f.seB).toBeNull();
    expect(f.A).toBeCloseTo(1000, 9);
    expect(Math.pow(100, f.B) * f.A).toBeCloseTo(800, 9);
  });
  it('refuses a single rate, non-positive values', () => {
    expect(() => fitPowerLaw([{ rate: 1, value: 5 }, { rate: 1, value: 6 }])).toThrow(/2 different strain rates/);
    expect(() => fitPowerLaw([{ rate: 1, value: 5 }, { rate: 2, value: 0 }])).toThrow(/positive/);
  });
});

describe('Student t quantile', () => {
  it.each(Object.entries(ref.t975))('t(0.975, df=%s) matches scipy.stats.t.ppf', (df, v) => {
    expect(studentTQuantile(0.975, Number(df))).toBeCloseTo(v, 8);
  });
});

describe('evaluateRateLaw', () => {
  it('power law value A·ε̇^B with a 95 % interval that is narrowest at the mean log rate', () => {
    const g = ref.regression;
    const f = fitPowerLaw(g.rate.map((rate, i) => ({ rate, value: g.L_um[i] })));
    const centre = Math.exp(f.law.fit!.meanLnRate);
    const a = evaluateRateLaw(f.law, centre);
    const b = evaluateRateLaw(f.law, 1e3);
    expect(a.value).toBeCloseTo(f.A * Math.pow(centre, f.B), 9);
    const w = (r: typeof a) => Math.log(r.interval95![1] / r.interval95![0]);
    expect(w(a)).toBeLessThan(w(b));
    // at the centre the half-width is t·s/√n (simple regression, Montgomery & Runger ch. 11)
    const s = f.law.fit!.residualSd;
    expect(w(a) / 2).toBeCloseTo((studentTQuantile(0.975, 4) * s) / Math.sqrt(6), 9);
  });
  it('outside the fitted range: error unless extrapolation is allowed, then a warning', () => {
    const f = fitPowerLaw([1, 10, 100].map((rate) => ({ rate, value: 1000 * rate ** -0.1 * (rate === 10 ? 1.01 : 1) })));
    expect(() => evaluateRateLaw(f.law, 1e5)).toThrow(/outside the fitted range/);
    const r = evaluateRateLaw(f.law, 1e5, true);
    expect(r.extrapolated).toBe(true);
    expect(r.warning).toMatch(/outside/);
  });
  it('table: linear in ln ε̇ between points', () => {
    const law = { law: 'table' as const, points: [{ rate: 1e-3, value: 900 }, { rate: 1e3, value: 1200 }] };
    // ε̇ = 1 /s is half-way in ln ε̇ between 1e-3 and 1e3
    expect(evaluateRateLaw(law, 1).value).toBeCloseTo(1050, 9);
    expect(evaluateRateLaw(law, 1e-3).value).toBeCloseTo(900, 12);
    expect(() => evaluateRateLaw(law, 1e4)).toThrow(/outside the table/);
    const ex = evaluateRateLaw(law, 1e9, true);
    // 1e9 lies 6 decades above 1e3, the end segment rises 300 MPa per 6 decades
    expect(ex.value).toBeCloseTo(1500, 9);
    expect(ex.warning).toMatch(/outside the table/);
  });
});

describe('parseRatePairsCsv', () => {
  it('reads L pairs in mm and σ_0 pairs in MPa', () => {
    const p = parseRatePairsCsv('# invented data\nrate [1/s], L [mm]\n0.001, 1.5\n1, 1.2\n', 'p.csv');
    expect(p.quantity).toBe('L');
    expect(p.pairs[0]).toEqual({ rate: 0.001, value: 1500 });
    expect(parseRatePairsCsv('strain_rate_1/s,sigma0_MPa\n1,900\n10,950\n', 'p.csv').quantity).toBe('sigma0');
  });
  it.each([
    ['rate [1/min], L [mm]\n1,1\n2,2\n', 'p.csv line 1: strain-rate column'],
    ['rate [1/s], L [furlong]\n1,1\n2,2\n', 'p.csv line 1: value column'],
    ['rate [1/s], L_um\n1,1\nx,2\n', 'p.csv line 3: strain rate "x" is not a number'],
    ['rate [1/s], L_um\n1,1\n2,-2\n', 'p.csv line 3: L -2 must be positive'],
    ['rate [1/s], L_um\n1,1\n', 'needs at least 2 data rows'],
  ])('refuses %#', (text, msg) => {
    expect(() => parseRatePairsCsv(text, 'p.csv')).toThrow(msg);
  });
});
