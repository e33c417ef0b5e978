import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { isFractozoneError } from '../../../src/core/errors.js';
import { createRaster } from '../../../src/core/image/raster.js';
import { defaultParams } from '../../../src/core/pipeline/params.js';
import {
  DEFAULT_FEATURES,
  FEATURES,
  FEATURE_NAMES,
  checkFeatureNames,
  computeFeature,
  defaultWindowUm,
  isFeatureName,
  parseFeatureList,
  type FeatureName,
  downsample,
  gradientEnergy,
  localEntropy,
  localStd,
  windowPxFromUm,
} from '../../../src/core/texture/index.js';

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    return isFractozoneError(e) ? e.code : `not a FractozoneError: ${String(e)}`;
  }
  return undefined;
}

function seeded(W: number, H: number, seed: number) {
  let a = seed >>> 0;
  const d = new Float32Array(W * H);
  for (let i = 0; i < d.length; i++) {
    a = (Math.imul(a, 1664525) + 1013904223) >>> 0;
    d[i] = a / 4294967296;
  }
  return createRaster(W, H, d);
}

describe('windowPxFromUm', () => {
  it('rounds to the nearest odd pixel count, at least 3', () => {
    expect(windowPxFromUm(60, 4)).toBe(15); // 15 px
    expect(windowPxFromUm(64, 4)).toBe(17); // 16 px: tie between 15 and 17 goes up
    expect(windowPxFromUm(62, 4)).toBe(15); // 15.5 px → 15
    expect(windowPxFromUm(67, 4)).toBe(17); // 16.75 px → 17
    expect(windowPxFromUm(1, 4)).toBe(3);
  });
  it('refuses non-positive lengths and pixel sizes', () => {
    expect(codeOf(() => windowPxFromUm(0, 4))).toBe('BAD_PARAMETER');
    expect(codeOf(() => windowPxFromUm(Number.NaN, 4))).toBe('BAD_PARAMETER');
    expect(codeOf(() => windowPxFromUm(10, 0))).toBe('BAD_SCALE');
    expect(codeOf(() => windowPxFromUm(10, -1))).toBe('BAD_SCALE');
  });
});

describe('defaultWindowUm', () => {
  it('is 1/25 of the specimen radius when that spans 7..31 px', () => {
    // radius 4 mm, 10 µm/px → 160 µm = 16 px
    expect(defaultWindowUm({ umPerPx: 10, specimenRadiusUm: 4000 })).toBeCloseTo(160, 9);
  });
  it('is clamped to 7 px and 31 px at working resolution', () => {
    expect(defaultWindowUm({ umPerPx: 10, specimenRadiusUm: 400 })).toBeCloseTo(70, 9); // 1 px → 7 px
    expect(defaultWindowUm({ umPerPx: 1, specimenRadiusUm: 4000 })).toBeCloseTo(31, 9); // 160 px → 31 px
    // downsampled by 8: working pixel 8 µm, 160 µm = 20 px is inside the clamp
    expect(defaultWindowUm({ umPerPx: 1, specimenRadiusUm: 4000, scaleFactor: 8 })).toBeCloseTo(160, 9);
  });
  it('estimates the radius as 0.4 × the smaller image side when unknown', () => {
    // 0.4 × 1000 px × 2 µm = 800 µm → 800/25 = 32 µm = 16 px
    expect(defaultWindowUm({ umPerPx: 2, imageWidthPx: 1500, imageHeightPx: 1000 })).toBeCloseTo(32, 9);
  });
  it('refuses missing or bad inputs', () => {
    expect(codeOf(() => defaultWindowUm({ umPerPx: 2 }))).toBe('BAD_PARAMETER');
    expect(codeOf(() => defaultWindowUm({ umPerPx: 0, specimenRadiusUm: 10 }))).toBe('BAD_SCALE');
    expect(codeOf(() => defaultWindowUm({ umPerPx: 1, specimenRadiusUm: -5 }))).toBe('BAD_PARAMETER');
    expect(codeOf(() => defaultWindowUm({ umPerPx: 1, specimenRadiusUm: 5, scaleFactor: 0.5 }))).toBe('BAD_PARAMETER');
  });
});

describe('feature registry', () => {
  const r = seeded(40, 30, 5);
  it('registers every feature with its name, unit, description, transform, gain power and window rule', () => {
    for (const n of FEATURE_NAMES) {
      expect(FEATURES[n].name).toBe(n);
      expect(FEATURES[n].unit.length).toBeGreaterThan(0);
      expect(FEATURES[n].description.length).toBeGreaterThan(0);
      expect(FEATURES[n].defaultWindow.minPx).toBeLessThan(FEATURES[n].defaultWindow.maxPx);
    }
    expect(FEATURES.gradientEnergy.linearInAreaFraction).toBe(true);
    expect(FEATURES.localStd.linearInAreaFraction).toBe(false);
    // brightness scaling under a multiplicative light change k: std → k·std, variance and
    // energies → k²·value, entropy of a histogram over the image's own range → unchanged
    // (definitions; checked numerically below)
    expect(FEATURES.localStd.gainPower).toBe(1);
    expect(FEATURES.localVariance.gainPower).toBe(2);
    expect(FEATURES.gradientEnergy.gainPower).toBe(2);
    expect(FEATURES.highPassEnergy.gainPower).toBe(2);
    expect(FEATURES.localEntropy.gainPower).toBe(0);
    expect(FEATURES.localEntropy.transform).toBe('identity');
    for (const n of ['localStd', 'localVariance', 'gradientEnergy', 'highPassEnergy'] as const) expect(FEATURES[n].transform).toBe('log');
  });
  it('each gain power is how the feature scales when the image is multiplied by k', () => {
    const k = 0.5;
    const dim = { ...r, data: r.data.map((v) => v * k) };
    for (const n of FEATURE_NAMES) {
      const a = computeFeature(n, r, 5);
      const b = computeFeature(n, dim, 5);
      const i = 17 * 40 + 20; // an interior pixel
      expect(b.data[i] / a.data[i], n).toBeCloseTo(k ** FEATURES[n].gainPower, 3);
    }
  });
  it('one default feature list: the parameters, the --features default and the README use it', () => {
    expect([...DEFAULT_FEATURES]).toEqual(defaultParams().features);
    for (const n of DEFAULT_FEATURES) expect(isFeatureName(n)).toBe(true);
    const readme = readFileSync(fileURLToPath(new URL('../../../README.md', import.meta.url)), 'utf8');
    expect(readme).toContain(`--features ${DEFAULT_FEATURES.join(',')}`);
  });
  it('parses and checks feature lists', () => {
    expect(parseFeatureList(' localStd, gradientEnergy ')).toEqual(['localStd', 'gradientEnergy']);
    expect(codeOf(() => parseFeatureList('localStd,roughness'))).toBe('BAD_PARAMETER');
    expect(codeOf(() => parseFeatureList(' , '))).toBe('BAD_PARAMETER');
    expect(codeOf(() => checkFeatureNames([42]))).toBe('BAD_PARAMETER');
  });
  it('computeFeature dispatches to the feature functions', () => {
    expect(computeFeature('localStd', r, 5).data).toEqual(localStd(r, 5).data);
    expect(computeFeature('gradientEnergy', r, 7).data).toEqual(gradientEnergy(r, 7).data);
    expect(computeFeature('localEntropy', r, 5, { bins: 16 }).data).toEqual(localEntropy(r, 40, 30, 5, { bins: 16 }).data);
  });
  it('refuses an unknown feature name', () => {
    expect(codeOf(() => computeFeature('roughness' as FeatureName, r, 5))).toBe('BAD_PARAMETER');
  });
});

describe('downsample', () => {
  it('integer factor = mean of k×k blocks; factor 1 returns the input', () => {
    const r = seeded(6, 4, 8);
    const d = downsample(r, 2);
    // area average, definition: block (1, 0) = pixels x 2..3, y 0..1
    const m = (r.data[2] + r.data[3] + r.data[8] + r.data[9]) / 4;
    expect(d.data[1]).toBeCloseTo(m, 6);
    expect(downsample(r, 1)).toBe(r);
    expect(codeOf(() => downsample(r, 0.5))).toBe('BAD_PARAMETER');
  });
});
