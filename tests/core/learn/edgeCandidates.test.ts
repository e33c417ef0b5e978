/**
 * The outline score of the model branch (learn/edgeCandidates.ts): radii of a closed outline along
 * rays, and the disagreement of candidate discs with an outside-probability map — checked on a
 * synthetic map whose surface is a known disc.
 */
import { describe, expect, it } from 'vitest';
import { outlineDisagreement, outlineRadii } from '../../../src/core/learn/edgeCandidates.js';

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
