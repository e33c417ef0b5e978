/**
 * The outline score of the model branch (learn/edgeCandidates.ts): radii of a closed outline along
 * rays, and the disagreement of candidate discs with an outside-probability map — checked on a
 * synthetic map whose surface is a known disc.
 */
import { describe, expect, it } from 'vitest';
import { outlineDisagreement, outlineRadii, outlinesApart, sureEdge } from '../../../src/core/learn/edgeCandidates.js';
import type { FractureEdge } from '../../../src/core/segment/fractureEdge.js';
import type { Ring } from '../../../src/core/segment/rings.js';

const circle = (cx: number, cy: number, r: number, n: number): { x: number; y: number }[] =>
  Array.from({ length: n }, (_, k) => ({ x: cx + r * Math.cos((2 * Math.PI * k) / n), y: cy - r * Math.sin((2 * Math.PI * k) / n) }));

describe('outline candidates scored by the outside probability', () => {
  it('gives the radius of a circle along every ray, about its own centre and about a point beside it', () => {
    const r = outlineRadii(circle(100, 100, 40, 200), { x: 100, y: 100 }, 360);
    expect(r.every((v) => v !== null && Math.abs(v - 40) < 0.02)).toBe(true);
    // about (110, 100): towards +x the circle is 30 px away, towards −x 50 px
    const s = outlineRadii(circle(100, 100, 40, 400), { x: 110, y: 100 }, 360);
    expect(s[0]).toBeCloseTo(30, 1);
    expect(s[180]).toBeCloseTo(50, 1);
  });

  it('scores the disc of the surface best, and a disc too small or too large worse', () => {
    const W = 200;
    const H = 200;
    const outside = new Float32Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) outside[y * W + x] = Math.hypot(x - 100, y - 100) < 50 ? 0.1 : 0.9;
    const c = { x: 100, y: 100 };
    const radii = [40, 50, 60].map((r) => outlineRadii(circle(100, 100, r, 360), c, 360));
    const [small, right, large] = outlineDisagreement(outside, W, H, c, radii, 20, 80);
    expect(right).toBeCloseTo(0.1, 2); // only the probability's own 0.1 of doubt is left
    expect(small).toBeGreaterThan(right + 0.1);
    expect(large).toBeGreaterThan(right + 0.1);
  });
});

describe('a sure choice of the edge search', () => {
  const ring = (coverage: number, roundnessPx: number): Ring => ({ ...({} as Ring), radiusPx: 200, coverage, roundnessPx, points: circle(0, 0, 200, 8) });
  const edge = (chosen: Ring | null, ambiguous = false, bent: Ring | null = null): FractureEdge => ({ chosen, rule: 'first-edge-outside-core', rings: [], center: { x: 0, y: 0 }, innerRoundEdge: false, ambiguous, sectionNotFound: false, bent });

  it('is an unambiguous, unbent ring clear on ≥ 90 % of the rays and round to 1.5 px', () => {
    expect(sureEdge(edge(ring(1, 0.15)))).toBe(true);
    expect(sureEdge(edge(ring(0.89, 0.15)))).toBe(false);
    expect(sureEdge(edge(ring(1, 1.6)))).toBe(false);
    expect(sureEdge(edge(ring(1, 0.15), true))).toBe(false);
    expect(sureEdge(edge(ring(1, 0.15), false, ring(0.6, 2)))).toBe(false);
    expect(sureEdge(edge(null))).toBe(false);
  });

  it('tells two outlines apart by their mean radius difference over the rays both have', () => {
    expect(outlinesApart([10, 20, null, 30], [12, 17, 5, null])).toBeCloseTo(2.5, 10);
    expect(outlinesApart([null], [1])).toBe(0);
  });
});
