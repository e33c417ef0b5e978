/**
 * samplePolar's fused sampling (the four cues with one cell and one set of weights, issue 16)
 * against four separate `bilinear` calls per sample, as it was written before.
 */
import { describe, expect, it } from 'vitest';
import { bilinear, polarAt, polarPoint, polarRay, samplePolar, type EdgeCues } from '../../../src/core/segment/polar.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

describe('samplePolar', () => {
  it('gives the values of four bilinear samples per grid point', () => {
    const rnd = lcg(3);
    const W = 67;
    const H = 45;
    const field = (): Float32Array => Float32Array.from({ length: W * H }, () => rnd() * 2 - 1);
    const cues: EdgeCues = { width: W, height: H, intensity: field(), roughness: field(), detailGx: field(), detailGy: field(), windowPx: 5 };
    const shape = { center: { x: 30.3, y: 21.7 }, ratio: 0.8, angleDeg: 25 };
    const nTheta = 36;
    const p = samplePolar(cues, shape, nTheta, 40, 0.5);
    const a = (shape.angleDeg * Math.PI) / 180;
    let inside = 0;
    for (let t = 0; t < nTheta; t++) {
      const th = (2 * Math.PI * t) / nTheta;
      const dx = Math.cos(th) * Math.cos(a) - shape.ratio * Math.sin(th) * Math.sin(a);
      const dy = Math.cos(th) * Math.sin(a) + shape.ratio * Math.sin(th) * Math.cos(a);
      let nx = Math.cos(th) * Math.cos(a) - (Math.sin(th) / shape.ratio) * Math.sin(a);
      let ny = Math.cos(th) * Math.sin(a) + (Math.sin(th) / shape.ratio) * Math.cos(a);
      const nn = Math.hypot(nx, ny);
      nx /= nn;
      ny /= nn;
      for (let j = 0; j < p.nR; j++) {
        const k = t * p.nR + j;
        const x = shape.center.x + j * 0.5 * dx;
        const y = shape.center.y + j * 0.5 * dy;
        if (x < 0 || y < 0 || x > W - 1 || y > H - 1) {
          expect(p.inside[k]).toBe(0);
          continue;
        }
        inside++;
        expect(p.intensity[k]).toBe(Math.fround(bilinear(cues.intensity, W, H, x, y)));
        expect(p.roughness[k]).toBe(Math.fround(bilinear(cues.roughness, W, H, x, y)));
        const gx = bilinear(cues.detailGx, W, H, x, y);
        const gy = bilinear(cues.detailGy, W, H, x, y);
        expect(p.grad2[k]).toBe(Math.fround(gx * gx + gy * gy));
        expect(p.gradRadial2[k]).toBeCloseTo((gx * nx + gy * ny) ** 2, 5);
      }
    }
    expect(inside).toBeGreaterThan(500);
  });
});

describe('polarRay / polarAt', () => {
  it('give the points of polarPoint (the ray computed once for many radii)', () => {
    const rnd = lcg(11);
    for (let n = 0; n < 50; n++) {
      const shape = { center: { x: rnd() * 500, y: rnd() * 400 }, ratio: 0.3 + 0.7 * rnd(), angleDeg: rnd() * 360 - 180 };
      const theta = (2 * Math.PI * Math.floor(rnd() * 180)) / 180;
      const ray = polarRay(shape, theta);
      for (let j = 0; j < 40; j++) {
        const r = j * 0.5 + 3 * rnd();
        // polarPoint as it was written before (its own trigonometry per call)
        const a = (shape.angleDeg * Math.PI) / 180;
        const u = r * Math.cos(theta);
        const v = r * shape.ratio * Math.sin(theta);
        const ref = { x: shape.center.x + u * Math.cos(a) - v * Math.sin(a), y: shape.center.y + u * Math.sin(a) + v * Math.cos(a) };
        expect(polarAt(shape, ray, r)).toEqual(ref);
        expect(polarPoint(shape, theta, r)).toEqual(ref);
      }
    }
  });
});
