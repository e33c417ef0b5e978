/**
 * A strain-rate law with stated scatter of A and B gives L(ε̇) an interval; without it the result
 * says so in words. Reference values are computed by hand with the first-order law of propagation
 * of uncertainty for uncorrelated inputs (JCGM 100:2008, GUM, eq. 10) applied to
 * ln L = ln A + B·ln ε̇: sd²(ln L) = (sd_A/A)² + (ln ε̇)²·sd_B².
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { FractozoneError } from '../../../src/core/errors.js';
import { parseMaterialSheet, resolveCriticalDistance, selectMaterial } from '../../../src/core/tcd/index.js';

const sheet = readFileSync(fileURLToPath(new URL('../../fixtures/tcd/materials.json', import.meta.url)), 'utf8');

function zx(patchL: Record<string, unknown>) {
  const doc = JSON.parse(sheet);
  Object.assign(doc.materials[0].dynamic.L, patchL);
  return selectMaterial(parseMaterialSheet(JSON.stringify(doc), 'm.json'), 'ZX-17 (invented)', 'm.json');
}

describe('L(ε̇) from a power law with scatter', () => {
  it('sdA and sdB: the delta-method interval, computed by hand', () => {
    // A = 1.4 mm = 1400 µm, B = −0.04 (fixture), sd_A = 0.07 mm (5 %, in the law's unit), sd_B = 0.01, ε̇ = 100 /s:
    // L = 1400·100^−0.04 = 1400·exp(−0.04·4.605170) = 1400·0.831764 = 1164.47 µm
    // sd_ln = √(0.05² + (4.605170·0.01)²) = √(0.0025 + 0.00212076) = 0.0679762
    // 95 %: L·exp(±1.959964·0.0679762) = L·exp(±0.133231) → 1019.22 … 1330.42 µm
    const r = resolveCriticalDistance({ material: zx({ sdA: 0.07, sdB: 0.01 }), strainRate: 100 });
    expect(r.L_um).toBeCloseTo(1164.47, 1);
    expect(r.interval95_um![0]).toBeCloseTo(1019.22, 1);
    expect(r.interval95_um![1]).toBeCloseTo(1330.42, 1);
    expect(r.intervalNote).toBeNull();
  });

  it('a relative sd of the value: L·exp(±1.96·relSd)', () => {
    const r = resolveCriticalDistance({ material: zx({ relSd: 0.1 }), strainRate: 10 });
    expect(r.interval95_um![1] / r.L_um).toBeCloseTo(Math.exp(1.959964 * 0.1), 6);
  });

  it('no scatter: the result says that the law gives none', () => {
    const r = resolveCriticalDistance({ material: zx({}), strainRate: 100 });
    expect(r.interval95_um).toBeNull();
    expect(r.intervalNote).toMatch(/^L has no interval: the law gives none/);
  });

  it('relSd together with sdA is refused with one clear message', () => {
    expect(() => zx({ relSd: 0.1, sdA: 5 })).toThrow(FractozoneError);
    expect(() => zx({ relSd: 0.1, sdA: 5 })).toThrow(/either relSd or sdA\/sdB/);
  });
});
