import { describe, expect, it } from 'vitest';
import type { BatchEntry } from '../../../src/core/report/csv.js';
import { NO_NOTCH, analyseSeries } from '../../../src/core/report/series.js';
import { makeResult } from '../../helpers/result.js';

function e(file: string, notch: string | undefined, rate: number | null, mean: number, L?: number, verdict?: string): BatchEntry {
  return {
    file,
    safeName: file,
    sha256: '',
    status: 'ok',
    metadata: notch ? { notch } : {},
    strainRatePerS: rate,
    material: null,
    overlay: null,
    result: L ? makeResult({ meanUm: mean, L_um: L, ratio: mean / L, verdict: (verdict ?? 'agrees') as 'agrees' }) : makeResult({ meanUm: mean }),
  };
}

describe('analyseSeries', () => {
  it('recovers an exact power law w = A·ε̇^B (constructed data: A = 50 µm, B = −0.1, R² = 1)', () => {
    const rates = [1e-3, 1e-1, 10, 1e3];
    const s = analyseSeries(rates.map((r, i) => e(`i${i}`, 'U', r, 50 * r ** -0.1)));
    const fit = s.notches[0].fit!;
    expect(fit.A_um).toBeCloseTo(50, 9);
    expect(fit.B).toBeCloseTo(-0.1, 12);
    expect(fit.r2).toBeCloseTo(1, 12);
    expect(fit.n).toBe(4);
  });

  it('groups by notch × strain rate with a Student-t interval of the group mean', () => {
    const s = analyseSeries([e('a', 'U', 1, 100, 90, 'agrees'), e('b', 'U', 1, 110, 90, 'wider'), e('c', 'V', 1, 80, 90), e('d', 'U', 10, 70, 60)]);
    expect(s.notches.map((n) => n.notch)).toEqual(['U', 'V']);
    const g = s.notches[0].groups[0];
    expect(g).toMatchObject({ notch: 'U', strainRatePerS: 1, n: 2, meanWidthUm: 105, L_um: 90, verdicts: { agrees: 1, wider: 1 } });
    // t(0.975, 1) = 12.706 (NIST/SEMATECH e-Handbook, table 1.3.6.7.2); sd of {100, 110} = 7.0711
    const half = (12.7062047 * Math.sqrt(50)) / Math.sqrt(2);
    expect(g.ci95Um![0]).toBeCloseTo(105 - half, 4);
    expect(g.ci95Um![1]).toBeCloseTo(105 + half, 4);
    expect(g.ratio).toBeCloseTo((100 / 90 + 110 / 90) / 2, 12);
    // a single image keeps its own interval; one strain rate gives no fit
    expect(s.notches[1].groups[0].ci95Um).toEqual([79, 81]);
    expect(s.notches[1].fit).toBeNull();
    expect(s.notches[1].fitNote).toMatch(/two strain rates/);
    expect(s.lCurve).toEqual([
      { strainRatePerS: 1, L_um: 90 },
      { strainRatePerS: 10, L_um: 60 },
    ]);
  });

  it('cuts the series interval at 0: a band width is not negative (two images far apart: t = 12.7)', () => {
    const s = analyseSeries([e('a', 'U', 1, 20), e('b', 'U', 1, 60)]);
    const g = s.notches[0].groups[0];
    const half = (12.7062047 * Math.sqrt(800)) / Math.sqrt(2); // sd of {20, 60} = 28.28
    expect(40 - half).toBeLessThan(0);
    expect(g.ci95Um![0]).toBe(0);
    expect(g.ci95Um![1]).toBeCloseTo(40 + half, 4);
  });

  it('leaves out failed, no-band and rate-less images, saying why; a missing notch gets its own group', () => {
    const failed: BatchEntry = { ...e('f', 'U', 1, 1), status: 'error', result: null };
    const nob: BatchEntry = { ...e('n', 'U', 1, 1), status: 'no-band' };
    const s = analyseSeries([failed, nob, e('r', 'U', null, 50), e('x', undefined, 2, 40)]);
    expect(s.excluded).toEqual([
      { file: 'f', reason: 'failed' },
      { file: 'n', reason: 'no band found' },
      { file: 'r', reason: 'no strain rate' },
    ]);
    expect(s.notches.map((n) => n.notch)).toEqual([NO_NOTCH]);
  });
});
