/**
 * Label rasters (src/core/learn/labels.ts): the sparse scan that visits only labelled pixels
 * (four values at a time skipped when all zero) sees every non-zero value in index order, also on
 * a view that does not start on a 4-byte boundary and with a length that is not a multiple of 4;
 * counting and checking build on it.
 */
import { describe, expect, it } from 'vitest';
import { checkLabels, countLabels, forEachLabelled } from '../../../src/core/learn/labels.js';
import { createRng } from '../../../src/core/random.js';

/** Sparse random labels 0–3 (about 2 % labelled). */
function sparse(n: number, seed: number): Uint8Array {
  const rng = createRng(seed);
  return Uint8Array.from({ length: n }, () => (rng.nextFloat() < 0.02 ? 1 + rng.int(3) : 0));
}

describe('label rasters', () => {
  it('visits every labelled pixel in index order, aligned or not, whatever the length', () => {
    const base = sparse(4003, 1);
    for (const offset of [0, 1, 2, 3]) {
      const view = base.subarray(offset);
      const seen: [number, number][] = [];
      forEachLabelled(view, (i, v) => seen.push([i, v]));
      const expected: [number, number][] = [];
      view.forEach((v, i) => v && expected.push([i, v]));
      expect(expected.length).toBeGreaterThan(40);
      expect(seen).toEqual(expected);
    }
  });

  it('counts per class and names the first value above 3 with its position', () => {
    const width = 67;
    const data = sparse(width * 41, 2);
    const counts = [0, 0, 0, 0];
    data.forEach((v) => counts[v]++);
    const labels = { width, height: 41, data };
    expect(countLabels(labels)).toEqual({ outside: counts[1], rim: counts[2], core: counts[3] });
    data[5 * width + 9] = 7;
    data[30 * width + 2] = 4;
    expect(() => checkLabels(labels, { width, height: 41 })).toThrow(/value 7 at \(x 9, y 5\)/);
  });
});
