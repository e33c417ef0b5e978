import { describe, expect, it } from 'vitest';
import { compareWidthWithL, criticalDistance, DEFAULT_TOLERANCE_PCT, impliedToughness } from '../../../src/core/tcd/index.js';

// width intervals symmetric in log space: [m/k, m·k]
const w = (mean: number, k: number) => ({ mean, ci95: [mean / k, mean * k] as [number, number] });

describe('compareWidthWithL verdicts (rule documented in src/core/tcd/compare.ts)', () => {
  it('default tolerance is 20 % (common practice for TCD predictions, no single source)', () => {
    expect(DEFAULT_TOLERANCE_PCT).toBe(20);
  });
  it('agrees: ratio interval inside [0.8, 1.2]', () => {
    const r = compareWidthWithL({ widthUm: w(1000, 1.05), L_um: 1000 });
    expect(r.verdict).toBe('agrees');
    expect(r.reference).toBe('L');
    expect(r.ratio).toBe(1);
    // no L interval: the ratio interval is the width interval divided by L
    expect(r.ratioInterval95[0]).toBeCloseTo(1 / 1.05, 12);
    expect(r.ratioInterval95[1]).toBeCloseTo(1.05, 12);
    expect(r.note).toMatch(/agrees/);
  });
  it('band-wider: whole interval above 1.2', () => {
    expect(compareWidthWithL({ widthUm: w(1500, 1.1), L_um: 1000 }).verdict).toBe('band-wider');
  });
  it('band-narrower: whole interval below 0.8', () => {
    expect(compareWidthWithL({ widthUm: w(500, 1.1), L_um: 1000 }).verdict).toBe('band-narrower');
  });
  it('inconclusive: interval straddles an edge', () => {
    const r = compareWidthWithL({ widthUm: w(1200, 1.05), L_um: 1000 });
    expect(r.verdict).toBe('inconclusive');
    expect(r.note).toMatch(/straddles/);
  });
  it('inconclusive: interval wider than the band even with the point estimate at 1', () => {
    const r = compareWidthWithL({ widthUm: w(1000, 1.5), L_um: 1000 });
    expect(r.verdict).toBe('inconclusive');
    expect(r.note).toMatch(/wider than the tolerance band/);
  });
  it('L interval widens the ratio interval: log sds add in quadrature', () => {
    const r = compareWidthWithL({ widthUm: w(1000, 1.05), L_um: 1000, L_interval95_um: [1000 / 1.05, 1000 * 1.05] });
    expect(Math.log(r.ratioInterval95[1])).toBeCloseTo(Math.SQRT2 * Math.log(1.05), 12);
    expect(r.verdict).toBe('agrees');
  });
  it('reference L/2 and 2L, and custom tolerance', () => {
    expect(compareWidthWithL({ widthUm: w(500, 1.02), L_um: 1000, reference: 'L/2' }).ratio).toBe(1);
    const r = compareWidthWithL({ widthUm: w(2000, 1.02), L_um: 1000, reference: '2L', tolerancePct: 5 });
    expect(r.referenceUm).toBe(2000);
    expect(r.verdict).toBe('agrees');
    expect(compareWidthWithL({ widthUm: w(1100, 1.02), L_um: 1000, tolerancePct: 5 }).verdict).toBe('band-wider');
  });
  it('degenerate width interval reaching 0 falls back to the linear form', () => {
    const r = compareWidthWithL({ widthUm: { mean: 100, ci95: [-20, 220] }, L_um: 1000 });
    expect(r.ratioInterval95[0]).toBe(0);
    expect(r.verdict).toBe('band-narrower');
  });
  it('refuses bad input', () => {
    expect(() => compareWidthWithL({ widthUm: w(0, 1.1), L_um: 1000 })).toThrow(/positive/);
    expect(() => compareWidthWithL({ widthUm: { mean: 5, ci95: [6, 7] }, L_um: 1000 })).toThrow(/outside its interval/);
    expect(() => compareWidthWithL({ widthUm: w(5, 1.1), L_um: 1000, tolerancePct: 0 })).toThrow(/tolerance/);
    expect(() => compareWidthWithL({ widthUm: w(5, 1.1), L_um: 1000, reference: '3L' as never })).toThrow(/reference/);
  });
});

describe('impliedToughness K = σ_0·√(π·w) (inverse of Taylor 2007 L)', () => {
  it('round trip with criticalDistance', () => {
    const L = criticalDistance(60, 900).L_um;
    const k = impliedToughness({ mean: L }, 900);
    expect(k.K_MPa_sqrtm).toBeCloseTo(60, 10);
    expect(k.interval95_MPa_sqrtm).toBeNull();
    expect(impliedToughness({ mean: L / 2 }, 900, { reference: 'L/2' }).K_MPa_sqrtm).toBeCloseTo(60, 10);
  });
  it('interval: K ∝ w^½, so a log-symmetric width interval ×/÷ k gives K ×/÷ √k', () => {
    const L = criticalDistance(60, 900).L_um;
    const k = impliedToughness({ mean: L, ci95: [L / 1.21, L * 1.21] }, 900);
    expect(k.interval95_MPa_sqrtm![1]).toBeCloseTo(60 * 1.1, 10);
    expect(k.interval95_MPa_sqrtm![0]).toBeCloseTo(60 / 1.1, 10);
  });
});
