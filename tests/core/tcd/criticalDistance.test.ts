import { describe, expect, it } from 'vitest';
import { FractozoneError } from '../../../src/core/errors.js';
import {
  criticalDistance,
  methodDistances,
  MPA_PER_KSI,
  MPA_SQRTM_PER_KSI_SQRTIN,
  parseLoad,
  parseQuantity,
  toughnessFromDistance,
} from '../../../src/core/tcd/index.js';

describe('criticalDistance', () => {
  it('L = (1/π)(K_c/σ_0)² (Taylor 2007): 60 MPa·√m, 900 MPa → 1414.7 µm', () => {
    // hand value: (60/900)² = 1/225 m; /π = 1.41471e-3 m
    const { L_m, L_um } = criticalDistance(60, 900);
    expect(L_m).toBeCloseTo(1 / 225 / Math.PI, 15);
    expect(L_um).toBeCloseTo(1414.7106, 3);
  });
  it('the same function gives the El Haddad–Topper–Smith a0 = (1/π)(ΔK_th/Δσ_0)² (El Haddad, Topper & Smith, EFM 1979)', () => {
    // ΔK_th = 5 MPa·√m, Δσ_0 = 250 MPa (invented values): a0 = (1/π)·(0.02 √m)² = 4e-4/π m = 127.32 µm
    expect(criticalDistance(5, 250).L_um).toBeCloseTo((4e-4 / Math.PI) * 1e6, 9);
    expect(criticalDistance(5, 250).L_um).toBeCloseTo(127.324, 3);
  });
  it('scales as K² and 1/σ²', () => {
    expect(criticalDistance(120, 900).L_um / criticalDistance(60, 900).L_um).toBeCloseTo(4, 12);
    expect(criticalDistance(60, 450).L_um / criticalDistance(60, 900).L_um).toBeCloseTo(4, 12);
  });
  it('inverse K = σ_0√(πL) returns the toughness', () => {
    expect(toughnessFromDistance(criticalDistance(47, 610).L_m, 610)).toBeCloseTo(47, 12);
  });
  it.each([
    [0, 900],
    [-60, 900],
    [NaN, 900],
    [60, 0],
    [60, Infinity],
  ])('refuses K=%s, σ=%s with a usage error', (k, s) => {
    expect(() => criticalDistance(k, s)).toThrow(FractozoneError);
  });
  it('method distances: point L/2, line 2L, area radius L (Taylor 2007)', () => {
    expect(methodDistances(1000)).toEqual({ pointDistance_um: 500, lineDistance_um: 2000, areaRadius_um: 1000 });
  });
});

describe('unit conversions (NIST SP 811 exact definitions; ASTM E399 factor)', () => {
  it('1 ksi = 6.894757293168361 MPa (1 lbf = 4.4482216152605 N, 1 in = 0.0254 m, NIST SP 811)', () => {
    expect(MPA_PER_KSI).toBeCloseTo(6.894757293168361, 14);
  });
  it('1 ksi·√in = 1.098843 MPa·√m (standard conversion factor, ASTM E399 / NIST SP 811)', () => {
    expect(MPA_SQRTM_PER_KSI_SQRTIN).toBeCloseTo(1.098843, 6);
    expect(MPA_SQRTM_PER_KSI_SQRTIN).toBeCloseTo(6.894757293168361 * Math.sqrt(0.0254), 15);
  });
  it('parses values with and without units', () => {
    expect(parseQuantity('60', 'toughness', 'K')).toBe(60);
    expect(parseQuantity('60MPa*sqrt(m)', 'toughness', 'K')).toBe(60);
    expect(parseQuantity('60 MPa√m', 'toughness', 'K')).toBe(60);
    expect(parseQuantity('60 MPa·√m', 'toughness', 'K')).toBe(60);
    expect(parseQuantity('50', 'toughness', 'K', 'imperial')).toBeCloseTo(50 * 1.0988434941, 8);
    expect(parseQuantity('50ksi*sqrt(in)', 'toughness', 'K')).toBeCloseTo(50 * 1.0988434941, 8);
    expect(parseQuantity('130ksi', 'stress', 's')).toBeCloseTo(130 * 6.894757293168361, 10);
    expect(parseQuantity('0.9GPa', 'stress', 's')).toBeCloseTo(900, 10);
    expect(parseQuantity('130', 'stress', 's', 'imperial')).toBeCloseTo(896.318448, 5);
  });
  it.each(['abc', '60 furlongs', '-5', '0', '60MPa', ''])('refuses toughness %j', (t) => {
    expect(() => parseQuantity(t, 'toughness', '--toughness')).toThrow(/--toughness/);
  });
  it('parses loads with their dimension', () => {
    expect(parseLoad('12.5kN', 'P')).toEqual({ value: 12500, dimension: 'force', unit: 'N' });
    expect(parseLoad('250MPa', 'P')).toEqual({ value: 250, dimension: 'stress', unit: 'MPa' });
    expect(parseLoad('1kip', 'P').value).toBeCloseTo(4448.2216152605, 9);
    expect(() => parseLoad('12.5', 'P')).toThrow(/no unit/);
    expect(() => parseLoad('12.5 parsecs', 'P')).toThrow(/unknown unit/);
  });
});
