import { describe, expect, it } from 'vitest';
import {
  effectiveSampleSize, lag1Autocorrelation, robustOutlierFlags, widthStatistics,
} from '../../../src/core/measure/index.js';

describe('widthStatistics', () => {
  it('gives hand-computed summary values', () => {
    // values 1..10: mean 5.5, median 5.5, sample sd = sqrt(82.5/9) = 3.02765 (hand computation)
    const v = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    const s = widthStatistics(v, { bootstrap: 200, circular: false });
    expect(s.n).toBe(10);
    expect(s.mean).toBeCloseTo(5.5, 12);
    expect(s.median).toBeCloseTo(5.5, 12);
    expect(s.sd).toBeCloseTo(Math.sqrt(82.5 / 9), 12);
    expect(s.min).toBe(1);
    expect(s.max).toBe(10);
    // simple-statistics quantileSorted: idx = n·p = 0.5 → x[ceil(0.5)−1] = x[0]; 9.5 → x[9]
    expect(s.p05).toBe(1);
    expect(s.p95).toBe(10);
  });

  it('naive CI equals mean ± t·sd/√n for uncorrelated data (t from A&S Table 26.10)', () => {
    // alternating values: ρ₁ < 0 → nEff = n
    const v = Array.from({ length: 20 }, (_, i) => (i % 2 ? 11 : 9));
    const s = widthStatistics(v, { bootstrap: 0 });
    expect(s.nEff).toBe(20);
    const h = 2.093 * s.sd / Math.sqrt(20); // t_0.975(19) = 2.093 (A&S Table 26.10)
    expect(s.ci95Mean[1] - s.mean).toBeCloseTo(h, 2);
    expect(s.ci95Median).toBeNull();
  });

  it('shrinks n to nEff for a smooth correlated profile and widens the CI', () => {
    const v = Array.from({ length: 360 }, (_, i) => 100 + 5 * Math.sin((2 * Math.PI * 3 * i) / 360));
    const s = widthStatistics(v, { bootstrap: 0 });
    expect(s.rho1).toBeGreaterThan(0.95);
    expect(s.nEff).toBeLessThan(10);
    expect(s.ci95Mean[1] - s.ci95Mean[0]).toBeGreaterThan(3 * (s.ci95MeanNaive[1] - s.ci95MeanNaive[0]));
  });

  it('cuts the lower end of the CI of the mean at 0 for non-negative widths, not for signed values', () => {
    // a few huge widths among small ones (a core sector taken as rim): mean − t·sd/√nEff < 0
    const v = Array.from({ length: 360 }, (_, i) => (i >= 300 && i < 310 ? 20000 : 400));
    const s = widthStatistics(v, { bootstrap: 0 });
    const h = (s.tQuantile * s.sd) / Math.sqrt(s.nEff);
    expect(s.mean - h).toBeLessThan(0); // the uncut interval would reach below 0
    expect(s.ci95Mean).toEqual([0, s.mean + h]);
    // signed values (differences) keep the plain interval
    const d = v.map((x) => x - 1000);
    const sd = widthStatistics(d, { bootstrap: 0 });
    expect(sd.ci95Mean[0]).toBeCloseTo(sd.mean - (sd.tQuantile * sd.sd) / Math.sqrt(sd.nEff), 9);
  });

  it('lag-1 autocorrelation: hand value for a short series', () => {
    // x = [1,2,3,4] (non-circular): mean 2.5, dev = [-1.5,-.5,.5,1.5], Σdev² = 5,
    // Σ dev_i·dev_{i+1} = .75 - .25 + .75 = 1.25 over 3 pairs → (1.25/3)·4/5 = 0.3333
    expect(lag1Autocorrelation([1, 2, 3, 4], false)).toBeCloseTo(1 / 3, 12);
    expect(effectiveSampleSize(100, 0.5)).toBeCloseTo(100 / 3, 12);
    expect(effectiveSampleSize(100, -0.3)).toBe(100);
    expect(effectiveSampleSize(100, 0.9999)).toBe(2);
  });

  it('bootstrap CI of the median is seeded, reproducible and brackets the median', () => {
    const v = Array.from({ length: 100 }, (_, i) => 50 + ((i * 37) % 17) - 8);
    const a = widthStatistics(v, { seed: 7 });
    const b = widthStatistics(v, { seed: 7 });
    const c = widthStatistics(v, { seed: 8 });
    expect(a.ci95Median).toEqual(b.ci95Median);
    expect(a.ci95Median![0]).toBeLessThanOrEqual(a.median);
    expect(a.ci95Median![1]).toBeGreaterThanOrEqual(a.median);
    expect(c.ci95Median).toBeDefined();
  });

  it('ignores NaN gaps and handles empty input', () => {
    const s = widthStatistics([1, NaN, 3], { bootstrap: 0 });
    expect(s.n).toBe(2);
    expect(s.mean).toBe(2);
    expect(widthStatistics([NaN]).n).toBe(0);
  });
});

describe('robustOutlierFlags', () => {
  it('flags points beyond 3.5·1.4826·MAD only', () => {
    // median 10, |dev| = [0,1,1,2,2,0,1,40] → MAD = 1; limit 3.5·1.4826 = 5.19 (hand computation)
    const v = [10, 11, 9, 12, 8, 10, 11, 50];
    expect(robustOutlierFlags(v)).toEqual([false, false, false, false, false, false, false, true]);
    // [16,10,11,9,10,10]: median 10, MAD 0.5 → limit 2.59; |6| is flagged (hand computation)
    expect(robustOutlierFlags([16, 10, 11, 9, 10, 10])[0]).toBe(true);
    // [12,10,11,9,10,10]: median 10, MAD 0.5 → limit 2.59; |2| stays unflagged (hand computation)
    expect(robustOutlierFlags([12, 10, 11, 9, 10, 10])[0]).toBe(false);
  });
});
