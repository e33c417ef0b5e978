/**
 * The model branch's boundary guide (learn/rays.ts `coreStep`): the matched step of the core
 * probability q along each ray, on a drawn q map where a patch of the band is half taken for core
 * (q = 0.3) and the classified core outline (the coarse line) runs along the patch's outer edge.
 */
import { describe, expect, it } from 'vitest';
import { coreStep } from '../../../src/core/learn/rays.js';
import { rayDirection } from '../../../src/core/measure/geometry.js';

const W = 400;
const H = 400;
const C = { x: 200, y: 200 };
const CORE_R = 100;
const PATCH_R = 118;
const OUTER_R = 150;

/** q: 1 in the core, 0.3 in the patch (angles 20–60°) between CORE_R and PATCH_R, 0 in the rest of the band. */
function qMap(): Float32Array {
  const q = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const r = Math.hypot(x - C.x, y - C.y);
      const a = ((Math.atan2(-(y - C.y), x - C.x) * 180) / Math.PI + 360) % 360;
      q[y * W + x] = r < CORE_R ? 1 : r < PATCH_R && a >= 20 && a <= 60 ? 0.3 : 0;
    }
  }
  return q;
}

describe('coreStep', () => {
  const nRays = 360;
  // the coarse line: the core outline, pushed out to the patch's outer edge over the patch
  const coarseR = (i: number): number => (i >= 20 && i <= 60 ? PATCH_R : CORE_R);
  const coarse = Array.from({ length: nRays }, (_, i) => {
    const d = rayDirection(i);
    return { x: C.x + coarseR(i) * d.x, y: C.y + coarseR(i) * d.y };
  });
  const outer = new Array<number | null>(nRays).fill(OUTER_R);
  const r = coreStep(qMap(), W, H, C, coarse, outer, nRays, 13, 19.5);

  it('puts the step where the core ends, also under the half-core patch', () => {
    for (let i = 0; i < nRays; i++) expect(Math.abs((r[i] as number) - CORE_R)).toBeLessThanOrEqual(1);
  });

  it('gives no radius where the outer edge is missing', () => {
    const o = [...outer];
    o[90] = null;
    expect(coreStep(qMap(), W, H, C, coarse, o, nRays, 13, 19.5)[90]).toBeNull();
  });
});
