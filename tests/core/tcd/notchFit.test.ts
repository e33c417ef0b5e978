import { describe, expect, it } from 'vitest';
import {
  bluntNotchCurve,
  criticalDistance,
  fitNotches,
  fitWithToughness,
  fromPlainSpecimens,
  holeCurve,
  predictFailureLoad,
  sharpCrackCurve,
  tabulatedCurve,
  type NotchSpecimen,
  type TcdMethod,
} from '../../../src/core/tcd/index.js';

// Independent closed forms of the unit fields (per unit load) used to make "test results":
// Creager & Paris 1967, per unit load with K = k·P
const cpStress = (k: number, rho: number, r: number): number => ((2 * k) / Math.sqrt(Math.PI)) * (r + rho) / Math.pow(2 * r + rho, 1.5);
// line mean over 0..d of the Creager–Paris field, ∫ computed by hand: 2k·d/√(π(2d+ρ)) / d
const cpLine = (k: number, rho: number, d: number): number => (2 * k) / Math.sqrt(Math.PI * (2 * d + rho));

const L_true = 250e-6; // m (invented)
const s0_true = 800; // MPa (invented)
const notches = [
  { name: 'sharp V (ρ 0.05 mm)', k: 0.02, rho: 0.05e-3 },
  { name: 'U (ρ 0.5 mm)', k: 0.02, rho: 0.5e-3 },
  { name: 'blunt U (ρ 2 mm)', k: 0.015, rho: 2e-3 },
];

function specimens(method: 'point' | 'line'): NotchSpecimen[] {
  return notches.map((n) => ({
    name: n.name,
    unitCurve: bluntNotchCurve(n.k, n.rho),
    failureLoad: s0_true / (method === 'point' ? cpStress(n.k, n.rho, L_true / 2) : cpLine(n.k, n.rho, 2 * L_true)),
  }));
}

describe('predictFailureLoad', () => {
  it('point method P_f = σ_0 / s(L/2) for a Creager–Paris notch', () => {
    expect(predictFailureLoad(bluntNotchCurve(0.02, 0.5e-3), L_true, s0_true, 'point')).toBeCloseTo(s0_true / cpStress(0.02, 0.5e-3, L_true / 2), 8);
  });
  it('LEFM limit: a crack with K per unit load k fails at P = K_c/k by point and line methods (Taylor 2007)', () => {
    const Kc = 45;
    const s0 = 700;
    const { L_m } = criticalDistance(Kc, s0);
    const k = 0.004; // MPa·√m per N (invented)
    for (const m of ['point', 'line'] as TcdMethod[]) {
      expect(predictFailureLoad(sharpCrackCurve(k), L_m, s0, m)).toBeCloseTo(Kc / k, 6);
    }
  });
});

describe('fitNotches round trips: curves made with known (L, σ_0) fit back (Taylor 2007 calibration)', () => {
  for (const method of ['point', 'line'] as const) {
    it(`${method} method, two notches: intersection gives (L, σ_0)`, () => {
      const f = fitNotches(specimens(method).slice(0, 2), method);
      expect(f.solver).toBe('intersection');
      expect(f.L_m / L_true).toBeCloseTo(1, 9);
      expect(f.sigma0_MPa / s0_true).toBeCloseTo(1, 9);
      for (const r of f.residuals) expect(r.ratio).toBeCloseTo(1, 9);
    });
    it(`${method} method, three notches: least squares gives (L, σ_0)`, () => {
      const f = fitNotches(specimens(method), method);
      expect(f.solver).toBe('least-squares');
      expect(f.L_m / L_true).toBeCloseTo(1, 6);
      expect(f.sigma0_MPa / s0_true).toBeCloseTo(1, 6);
      expect(f.rmsLogResidualPct).toBeLessThan(1e-4);
    });
  }
  it('three notches with scatter: residuals report predicted/actual and σ_0 is their geometric centre', () => {
    const sp = specimens('point');
    sp[2] = { ...sp[2], failureLoad: sp[2].failureLoad * 1.08 };
    const f = fitNotches(sp, 'point');
    const prod = f.residuals.reduce((a, r) => a * r.ratio, 1);
    expect(prod).toBeCloseTo(1, 9);
    expect(f.residuals.some((r) => Math.abs(r.ratio - 1) > 0.005)).toBe(true);
    for (const r of f.residuals) expect(r.predictedLoad / r.failureLoad).toBeCloseTo(r.ratio, 12);
  });
  it('tabulated curves (sampled from the formula) fit back within sampling error', () => {
    const sp = notches.slice(0, 2).map((n) => {
      const r: number[] = [];
      const s: number[] = [];
      for (let i = 0; i <= 3000; i++) {
        const x = (i / 3000) * 3e-3;
        r.push(x);
        s.push(cpStress(n.k, n.rho, x));
      }
      return { name: n.name, unitCurve: tabulatedCurve(r, s, n.name), failureLoad: s0_true / cpStress(n.k, n.rho, L_true / 2) };
    });
    const f = fitNotches(sp, 'point');
    expect(f.L_m / L_true).toBeCloseTo(1, 3);
    expect(f.sigma0_MPa / s0_true).toBeCloseTo(1, 3);
  });
  it('a hole and a crack (different field shapes) fit back', () => {
    const hole = holeCurve(1e-3, 1); // per unit remote stress
    const crack = sharpCrackCurve(Math.sqrt(Math.PI * 0.5e-3)); // K per unit remote stress, crack a = 0.5 mm (K = σ√(πa))
    const kirschEdge = (x: number) => 1 + 0.5 * (1e-3 / (1e-3 + x)) ** 2 + 1.5 * (1e-3 / (1e-3 + x)) ** 4;
    const sp = [
      { name: 'hole', unitCurve: hole, failureLoad: s0_true / kirschEdge(L_true / 2) },
      { name: 'crack', unitCurve: crack, failureLoad: s0_true / (Math.sqrt(Math.PI * 0.5e-3) / Math.sqrt(2 * Math.PI * (L_true / 2))) },
    ];
    const f = fitNotches(sp, 'point', { range_m: [1e-7, 0.1] });
    expect(f.L_m / L_true).toBeCloseTo(1, 8);
  });
  it('curves that never cross are refused with a processing error', () => {
    const sp = [
      { name: 'a', unitCurve: bluntNotchCurve(1, 1e-3), failureLoad: 10 },
      { name: 'b', unitCurve: bluntNotchCurve(1, 1e-3), failureLoad: 20 },
    ];
    expect(() => fitNotches(sp, 'point', { range_m: [1e-7, 1e-2] })).toThrow(/do not cross/);
  });
  it('needs two specimens and positive loads', () => {
    expect(() => fitNotches(specimens('point').slice(0, 1), 'point')).toThrow(/at least 2/);
    const sp = specimens('point');
    sp[0] = { ...sp[0], failureLoad: -1 };
    expect(() => fitNotches(sp, 'point')).toThrow(/must be positive/);
  });
});

describe('calibration with a known toughness', () => {
  it('one notch + K_c fits L back (σ_0 = K_c/√(πL))', () => {
    const Kc = s0_true * Math.sqrt(Math.PI * L_true);
    const n = notches[1];
    const sp = { name: n.name, unitCurve: bluntNotchCurve(n.k, n.rho), failureLoad: s0_true / cpStress(n.k, n.rho, L_true / 2) };
    const f = fitWithToughness(Kc, sp, 'point', [1e-7, 1e-2]);
    expect(f.L_m / L_true).toBeCloseTo(1, 8);
    expect(f.sigma0_MPa / s0_true).toBeCloseTo(1, 8);
  });
  it('plain specimens: σ_0 = plain strength (brittle shortcut)', () => {
    const r = fromPlainSpecimens(60, 900);
    expect(r.L_um).toBeCloseTo(1414.71, 2);
    expect(r.sigma0_MPa).toBe(900);
  });
});
