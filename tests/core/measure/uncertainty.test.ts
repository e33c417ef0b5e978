/**
 * The measurement-interval model (src/core/measure/uncertainty.ts): the random part follows the
 * correlation of the residual profile, the budget adds up, the scale term follows its source.
 */
import { describe, expect, it } from 'vitest';
import { COVERAGE_FACTOR_95, localisationTerm, measurementInterval, scaleRelativeSd } from '../../../src/core/measure/uncertainty.js';
import { createRng } from '../../../src/core/random.js';

function noise(n: number, sd: number, seed: number): number[] {
  const rng = createRng(seed);
  return Array.from({ length: n }, () => sd * rng.normal());
}

describe('localisation term', () => {
  it('independent per-ray scatter averages down as s/√n', () => {
    const r = noise(360, 2, 7).map((e) => 500 + e);
    const t = localisationTerm(r, 0);
    // the residual around a 15-ray running median keeps most of the scatter of white noise
    expect(t.perRaySdUm).toBeGreaterThan(1.4);
    expect(t.perRaySdUm).toBeLessThan(2.4);
    expect(t.correlationRays).toBeLessThan(2);
    expect(t.randomSdUm).toBeCloseTo(t.perRaySdUm * Math.sqrt(t.correlationRays / 360), 10);
  });

  it('scatter correlated along the circumference gives a wider interval than independence would', () => {
    // a 4-ray moving average of white noise: correlated over a few rays
    const w = noise(364, 2, 9);
    const r = Array.from({ length: 360 }, (_, i) => 500 + (w[i] + w[i + 1] + w[i + 2] + w[i + 3]) / 2);
    const t = localisationTerm(r, 0);
    expect(t.correlationRays).toBeGreaterThan(2);
    expect(t.randomSdUm).toBeGreaterThan((1.5 * t.perRaySdUm) / Math.sqrt(360));
  });

  it('a smooth real shape (an ellipse) is not counted as placement scatter', () => {
    const r = Array.from({ length: 360 }, (_, i) => 500 + 40 * Math.cos((2 * Math.PI * 2 * i) / 360));
    // only the running median's own curvature error is left: < 1 % of the 40 µm amplitude
    expect(localisationTerm(r, 0).perRaySdUm).toBeLessThan(0.4);
  });

  it('adds the systematic part in quadrature', () => {
    const t = localisationTerm(noise(360, 1, 3).map((e) => 300 + e), 2);
    expect(t.sdUm).toBeCloseTo(Math.hypot(t.randomSdUm, 2), 12);
  });
});

describe('scale term', () => {
  it('a typed pixel size: the tolerance read as a 95 % half-width', () => {
    expect(scaleRelativeSd({ source: 'typed', pixelSizeTolerancePct: 1 }).relSd).toBeCloseTo(0.01 / 1.959964, 6);
  });
  it('a scale bar: two ends of 0.3 px each over the bar length', () => {
    expect(scaleRelativeSd({ source: 'scale-bar', barLengthPx: 300, pixelSizeTolerancePct: 0.5 }).relSd).toBeCloseTo((Math.SQRT2 * 0.3) / 300, 12);
  });
});

describe('measurement interval and budget', () => {
  it('the half-width is k·√Σu² and the shares sum to 100 %', () => {
    const b = localisationTerm(noise(360, 3, 1).map((e) => 800 + e), 1.5);
    const o = localisationTerm(noise(360, 0.5, 2).map((e) => 1200 + e), 0.8);
    const { ci95Um, budget } = measurementInterval(400, b, o, { relSd: 0.004, detail: 'typed' });
    const u = Math.sqrt(b.sdUm ** 2 + o.sdUm ** 2 + (400 * 0.004) ** 2);
    expect(budget.combinedSdUm).toBeCloseTo(u, 12);
    expect((ci95Um[1] - ci95Um[0]) / 2).toBeCloseTo(COVERAGE_FACTOR_95 * u, 10);
    expect(budget.boundary.sharePct + budget.outerEdge.sharePct + budget.scale.sharePct).toBeCloseTo(100, 10);
    expect(budget.scale.sdUm).toBeCloseTo(1.6, 12);
  });
});
