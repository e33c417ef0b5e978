/**
 * The band's uncertainty block on rendered fractographs with known truth (our generator,
 * src/core/render): the measurement interval covers the true mean of the measured rays and is
 * narrow, the parameter range contains the mean, the budget adds up, the verdict names its basis.
 * Targets from issue 15 (coverage ≥ 90 % with a median half-width ≤ 5 % on the rendered set; the
 * whole sets are in scripts/validate-uncertainty.mjs, figures in the README).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { renderFractograph, type RenderOptions, type RenderTruth } from '../../../src/core/render/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { analyseImage, defaultParams, remeasure, type MeasureResult } from '../../../src/core/pipeline/index.js';

const BASE: RenderOptions = { widthPx: 1000, heightPx: 760, umPerPx: 8.5, noiseSigma: 0, blurSigmaPx: 0, vignetting: 0 };

const CASES: { name: string; opts: RenderOptions }[] = [
  { name: 'clean round', opts: { ...BASE, seed: 11 } },
  { name: 'noisy (σ = 0.04)', opts: { ...BASE, seed: 13, noiseSigma: 0.04 } },
  { name: 'tilted 30° (elliptic)', opts: { ...BASE, seed: 18, specimen: { tiltDeg: 30, tiltAxisDeg: 20 } } },
];

function truthMean(t: RenderTruth, r: MeasureResult): number {
  const vals: number[] = [];
  for (const ray of r.band.profile) {
    if (!ray.valid) continue;
    const w = t.band.widthUmByAngle[Math.round(ray.angleDeg) % 360];
    if (w !== null) vals.push(w);
  }
  return vals.reduce((a, b) => a + b, 0) / vals.length;
}

const runs: { name: string; r: MeasureResult; t: RenderTruth }[] = [];

beforeAll(async () => {
  for (const c of CASES) {
    const { raster, truth } = renderFractograph(c.opts);
    const p = defaultParams();
    p.scale.pixelSizeUm = truth.umPerPxX;
    p.bootstrap = 100;
    p.material = { toughness: { value: 20 }, strength: { value: 560, sd: 20 } };
    const { result } = await analyseImage(encodeGrayRaster(raster, { format: 'png', bitDepth: 8 }), { file: `${c.name}.png`, sha256: 'test' }, p);
    runs.push({ name: c.name, r: result, t: truth });
  }
}, 240_000);

describe('band uncertainty on rendered images', () => {
  it('the measurement interval covers the true mean of the measured rays, with a half-width ≤ 5 % of the mean', () => {
    for (const { name, r, t } of runs) {
      const u = r.band.uncertainty!;
      const truth = truthMean(t, r);
      const [lo, hi] = u.measurementCi95Um;
      expect({ name, covers: lo <= truth && truth <= hi }).toEqual({ name, covers: true });
      expect((hi - lo) / 2 / r.band.widthUm!.mean).toBeLessThan(0.05);
      // and it is narrower than the circumferential interval (this specimen's census vs a sample)
      expect(hi - lo).toBeLessThan(u.circumferentialCi95Um[1] - u.circumferentialCi95Um[0]);
    }
  });

  it('the parameter range contains the mean and lists every variation', () => {
    for (const { r } of runs) {
      const u = r.band.uncertainty!;
      const m = r.band.widthUm!.mean;
      expect(u.parameterRangeUm![0]).toBeLessThanOrEqual(m);
      expect(u.parameterRangeUm![1]).toBeGreaterThanOrEqual(m);
      expect(u.variations.map((v) => v.name)).toEqual([
        'window ×0.7',
        'window ×1.4',
        'without localStd',
        'without localEntropy',
        'without gradientEnergy',
        'boundary level: log-variance midpoint',
        'boundary level: standard-deviation midpoint',
      ]);
      const vals = u.variations.map((v) => v.meanUm).filter((v): v is number => v !== null);
      expect(Math.min(m, ...vals)).toBeCloseTo(u.parameterRangeUm![0], 2);
      expect(Math.max(m, ...vals)).toBeCloseTo(u.parameterRangeUm![1], 2);
    }
  });

  it('the budget adds up to the interval and the circumferential interval is the old one', () => {
    for (const { r } of runs) {
      const u = r.band.uncertainty!;
      const g = u.budget;
      const comb = Math.hypot(g.boundary.sdUm, g.outerEdge.sdUm, g.scale.sdUm);
      expect(g.combinedSdUm).toBeCloseTo(comb, 2);
      expect((u.measurementCi95Um[1] - u.measurementCi95Um[0]) / 2).toBeCloseTo(g.coverageFactor * g.combinedSdUm, 1);
      expect(g.boundary.sharePct + g.outerEdge.sharePct + g.scale.sharePct).toBeCloseTo(100, 0);
      expect(u.circumferentialCi95Um).toEqual(r.band.widthUm!.ci95);
    }
  });

  it('the comparison says which intervals it used; another basis is chosen by a parameter', () => {
    const { r } = runs[0];
    expect(r.params.verdictBasis).toBe('measurement');
    expect(r.comparison!.basis!.width).toBe('measurement');
    expect(r.comparison!.basis!.widthCi95Um).toEqual(r.band.uncertainty!.measurementCi95Um);
    expect(r.comparison!.basis!.L).toBe('interval');
    const c = remeasure(r, { verdictBasis: 'circumferential' });
    expect(c.comparison!.basis!.width).toBe('circumferential');
    expect(c.comparison!.basis!.note).toMatch(/circumferential/);
    expect(c.comparison!.ratioInterval95[1] - c.comparison!.ratioInterval95[0]).toBeGreaterThan(r.comparison!.ratioInterval95[1] - r.comparison!.ratioInterval95[0]);
    // a re-measure on the same boundary keeps the interval and the parameter range
    expect(c.band.uncertainty!.measurementCi95Um).toEqual(r.band.uncertainty!.measurementCi95Um);
    expect(c.band.uncertainty!.parameterRangeUm).toEqual(r.band.uncertainty!.parameterRangeUm);
  });
});
