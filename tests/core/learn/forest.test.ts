/**
 * The random forest (src/core/learn/forest.ts): it learns what it should (a non-linear class
 * layout, a minority class), its out-of-bag accuracy tells apart learnable from random labels, and
 * the same samples and seed give the same trees bit for bit.
 */
import { describe, expect, it } from 'vitest';
import { predictMany, predictOne, trainForest, type Forest } from '../../../src/core/learn/forest.js';
import { createRng } from '../../../src/core/random.js';

/** Points in the unit square: class 0 inside a ring 0.2 < r < 0.35 around (0.5, 0.5), class 1 in the middle, class 2 outside (not linearly separable). */
function rings(n: number, seed: number, noiseFeatures = 2): { X: Float32Array; y: Uint8Array; F: number } {
  const rng = createRng(seed);
  const F = 2 + noiseFeatures;
  const X = new Float32Array(n * F);
  const y = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const a = rng.nextFloat();
    const b = rng.nextFloat();
    const r = Math.hypot(a - 0.5, b - 0.5);
    X[i * F] = a;
    X[i * F + 1] = b;
    for (let k = 2; k < F; k++) X[i * F + k] = rng.nextFloat();
    y[i] = r < 0.2 ? 1 : r < 0.35 ? 0 : 2;
  }
  return { X, y, F };
}

function accuracy(f: Forest, X: Float32Array, y: Uint8Array, F: number): number {
  const out = [0, 1, 2].map(() => new Float32Array(y.length));
  predictMany(f, X, out);
  let ok = 0;
  for (let i = 0; i < y.length; i++) {
    const best = out[0][i] >= out[1][i] && out[0][i] >= out[2][i] ? 0 : out[1][i] >= out[2][i] ? 1 : 2;
    if (best === y[i]) ok++;
  }
  return ok / y.length;
}

const OPTS = { nTrees: 24, maxDepth: 12, minSplit: 4, seed: 7 };

describe('random forest', () => {
  it('learns a ring layout: held-out accuracy and out-of-bag accuracy above 0.93', () => {
    const train = rings(3000, 1);
    const test = rings(2000, 2);
    const t = trainForest(train.X, train.y, train.F, 3, OPTS);
    expect(accuracy(t.forest, test.X, test.y, test.F)).toBeGreaterThan(0.93);
    expect(t.oobAccuracy).toBeGreaterThan(0.93);
    expect(t.oobSamples).toBeGreaterThan(2900);
  });

  it('gives an out-of-bag accuracy near chance for random labels', () => {
    const d = rings(1500, 3);
    const rng = createRng(9);
    const y = Uint8Array.from(d.y, () => rng.int(3));
    const t = trainForest(d.X, y, d.F, 3, OPTS);
    expect(t.oobAccuracy).toBeLessThan(0.45);
    expect(t.oobAccuracy).toBeGreaterThan(0.2);
  });

  it('balances classes: a class of 3 % of the samples is still found', () => {
    const rng = createRng(4);
    const n = 3000;
    const X = new Float32Array(n * 2);
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      y[i] = i % 33 === 0 ? 2 : i % 2;
      X[2 * i] = y[i] + 0.45 * rng.normal();
      X[2 * i + 1] = rng.normal();
    }
    const t = trainForest(X, y, 2, 3, OPTS);
    expect(t.oobAccuracyByClass[2]).toBeGreaterThan(0.75);
    const p = new Float64Array(3);
    predictOne(t.forest, [2, 0], p);
    expect(p[2]).toBeGreaterThan(0.5);
    expect(p[0] + p[1] + p[2]).toBeCloseTo(1, 6);
  });

  it('is deterministic: same samples and seed give the same trees; another seed other trees', () => {
    const d = rings(800, 5);
    const a = trainForest(d.X, d.y, d.F, 3, OPTS).forest;
    const b = trainForest(d.X, d.y, d.F, 3, OPTS).forest;
    const c = trainForest(d.X, d.y, d.F, 3, { ...OPTS, seed: 8 }).forest;
    expect(Array.from(b.threshold)).toEqual(Array.from(a.threshold));
    expect(Array.from(b.feature)).toEqual(Array.from(a.feature));
    expect(Array.from(b.value)).toEqual(Array.from(a.value));
    expect(Array.from(c.threshold)).not.toEqual(Array.from(a.threshold));
  });

  it('predicts the same probabilities one by one and in bulk', () => {
    const d = rings(500, 6);
    const f = trainForest(d.X, d.y, d.F, 3, OPTS).forest;
    const out = [0, 1, 2].map(() => new Float32Array(d.y.length));
    predictMany(f, d.X, out);
    const p = new Float64Array(3);
    for (const i of [0, 17, 250, 499]) {
      predictOne(f, d.X.subarray(i * d.F, (i + 1) * d.F), p);
      for (let c = 0; c < 3; c++) expect(out[c][i]).toBeCloseTo(p[c], 5);
    }
  });

  it('refuses features that are not finite and classes out of range', () => {
    const X = new Float32Array([0, 1, NaN, 2]);
    expect(() => trainForest(X, new Uint8Array([0, 1]), 2, 2, OPTS)).toThrow(/finite/);
    expect(() => trainForest(new Float32Array([0, 1, 2, 3]), new Uint8Array([0, 5]), 2, 2, OPTS)).toThrow(/class 5/);
  });
});
