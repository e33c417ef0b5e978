import { describe, expect, it } from 'vitest';
import { FractozoneError } from '../../../src/core/errors.js';
import {
  areaMeanStress,
  bluntNotchCurve,
  criticalDistance,
  effectiveStress,
  holeCurve,
  kirschStressFromCentre,
  lineMeanStress,
  scaleCurve,
  sharpCrackCurve,
  tabulatedCurve,
} from '../../../src/core/tcd/index.js';
import { ref } from './fixtures.js';

describe('sharp crack σ = K/√(2πr) — LEFM limit of the TCD (Taylor 2007)', () => {
  const Kc = 60;
  const s0 = 900;
  const { L_m } = criticalDistance(Kc, s0);
  const crack = sharpCrackCurve(Kc); // the crack loaded exactly to K = K_c
  it('point method at L/2 gives σ_0 exactly when K = K_c', () => {
    expect(effectiveStress(crack, L_m, 'point')).toBeCloseTo(s0, 9);
  });
  it('line method over 2L gives σ_0 exactly when K = K_c (closed-form integral)', () => {
    expect(effectiveStress(crack, L_m, 'line')).toBeCloseTo(s0, 9);
  });
  it('field value K/√(2πr) (Irwin 1957)', () => {
    expect(crack.stressAt(1e-3)).toBeCloseTo(60 / Math.sqrt(2 * Math.PI * 1e-3), 9);
  });
  it('area method with the distance-only assumption: (4/3)K/√(2πR) (derived by hand, documented in the module)', () => {
    expect(areaMeanStress(crack, L_m)).toBeCloseTo(((4 / 3) * Kc) / Math.sqrt(2 * Math.PI * L_m), 9);
  });
});

describe('Creager–Paris blunt notch (Creager & Paris, Int. J. Fract. Mech. 1967)', () => {
  const K = 30;
  const rho = 0.25e-3;
  const c = bluntNotchCurve(K, rho);
  it('peak at the root is 2K/√(πρ)', () => {
    expect(c.stressAt(0)).toBeCloseTo((2 * K) / Math.sqrt(Math.PI * rho), 9);
  });
  it('formula value (2K/√π)(r+ρ)/(2r+ρ)^{3/2} at r = ρ', () => {
    expect(c.stressAt(rho)).toBeCloseTo(((2 * K) / Math.sqrt(Math.PI)) * (2 * rho) / Math.pow(3 * rho, 1.5), 9);
  });
  it('far field approaches the sharp crack K/√(2πr) for r ≫ ρ', () => {
    const crack = sharpCrackCurve(K);
    const r1 = 100 * rho;
    const r2 = 10000 * rho;
    const e1 = Math.abs(c.stressAt(r1) / crack.stressAt(r1) - 1);
    const e2 = Math.abs(c.stressAt(r2) / crack.stressAt(r2) - 1);
    // leading-order relative difference ρ/(4r) (series of the two formulas, derived by hand)
    expect(e1).toBeCloseTo(0.01 / 4, 4);
    expect(e2).toBeCloseTo(1e-4 / 4, 6);
    expect(e2).toBeLessThan(e1);
  });
  it('closed-form integrals match SciPy quad (tests/fixtures/tcd/reference.json)', () => {
    const cp = bluntNotchCurve(1, ref.integrals.rho_m);
    expect(cp.integral(ref.integrals.d_m) / ref.integrals.creagerParis_int).toBeCloseTo(1, 12);
    expect(cp.momentIntegral(ref.integrals.d_m) / ref.integrals.creagerParis_moment).toBeCloseTo(1, 12);
  });
});

describe('Kirsch hole (Timoshenko & Goodier, Theory of Elasticity, §35)', () => {
  it('Kt = 3 at the hole edge', () => {
    expect(kirschStressFromCentre(2e-3, 2e-3, 100)).toBeCloseTo(300, 12);
    expect(holeCurve(2e-3, 100).stressAt(0)).toBeCloseTo(300, 12);
  });
  it('formula σ∞[1 + ½(a/r)² + (3/2)(a/r)⁴] at r = 2a: 1.21875σ∞', () => {
    // hand value: 1 + 0.5/4 + 1.5/16 = 1.21875
    expect(kirschStressFromCentre(4e-3, 2e-3, 100)).toBeCloseTo(121.875, 12);
    expect(holeCurve(2e-3, 100).stressAt(2e-3)).toBeCloseTo(121.875, 12);
  });
  it('tends to σ∞ far away', () => {
    expect(kirschStressFromCentre(1, 1e-3, 100)).toBeCloseTo(100, 3);
  });
  it('refuses r < a from the centre', () => {
    expect(() => kirschStressFromCentre(1e-3, 2e-3, 100)).toThrow(FractozoneError);
  });
  it('closed-form integrals from the edge match SciPy quad', () => {
    const h = holeCurve(ref.integrals.a_m, 1);
    expect(h.integral(ref.integrals.d_m) / ref.integrals.kirschEdge_int).toBeCloseTo(1, 12);
    expect(h.momentIntegral(ref.integrals.d_m) / ref.integrals.kirschEdge_moment).toBeCloseTo(1, 12);
  });
});

describe('tabulated curves', () => {
  const c = tabulatedCurve([0, 1e-3, 2e-3, 4e-3], [300, 200, 150, 100], 'c.csv');
  it('interpolates linearly inside', () => {
    expect(c.stressAt(0.5e-3)).toBeCloseTo(250, 12);
    expect(c.stressAt(3e-3)).toBeCloseTo(125, 12);
  });
  it('line mean is exact for the piecewise-linear curve (trapezoids by hand)', () => {
    // ∫0^3mm = 0.5(300+200)·1 + 0.5(200+150)·1 + 0.5(150+125)·1 = 250+175+137.5 = 562.5 MPa·mm
    expect(lineMeanStress(c, 3e-3)).toBeCloseTo(562.5 / 3, 10);
  });
  it('area moment is exact for a linear segment (∫(300 − 1e5 r) r dr by hand)', () => {
    // on [0, 1 mm] σ = 300 − 1e5·r: ∫ = 300·R²/2 − 1e5·R³/3, R = 1e-3
    const R = 1e-3;
    expect(areaMeanStress(c, R)).toBeCloseTo((2 / (R * R)) * (300 * R * R / 2 - (1e5 * R ** 3) / 3), 9);
  });
  it('refuses distances beyond the last point (no extrapolation)', () => {
    expect(() => c.stressAt(5e-3)).toThrow(/beyond the last point/);
    expect(() => lineMeanStress(c, 5e-3)).toThrow(/c\.csv/);
  });
  it('refuses fewer than 3 points and non-increasing distance', () => {
    expect(() => tabulatedCurve([0, 1e-3], [1, 2], 'x')).toThrow(/at least 3 points/);
    expect(() => tabulatedCurve([0, 1e-3, 1e-3], [1, 2, 3], 'x')).toThrow(/increase strictly/);
  });
  it('a densely sampled Creager–Paris curve reproduces the analytic line mean', () => {
    const cp = bluntNotchCurve(20, 0.5e-3);
    const r: number[] = [];
    const s: number[] = [];
    for (let i = 0; i <= 4000; i++) {
      const x = (i / 4000) * 5e-3;
      r.push(x);
      s.push(((2 * 20) / Math.sqrt(Math.PI)) * (x + 0.5e-3) / Math.pow(2 * x + 0.5e-3, 1.5));
    }
    const t = tabulatedCurve(r, s, 'dense');
    expect(lineMeanStress(t, 2e-3) / lineMeanStress(cp, 2e-3)).toBeCloseTo(1, 5);
  });
  it('scaling multiplies stresses and integrals', () => {
    const k = scaleCurve(c, 2);
    expect(k.stressAt(1e-3)).toBe(400);
    expect(k.integral(2e-3)).toBeCloseTo(2 * c.integral(2e-3), 12);
  });
});
