/**
 * The centre vote (segment/rings.ts `voteCentre`) against the plain form it replaced (issue 16):
 * full-size gradient rasters, a float32 accumulator, the ±1 sign loop and the direct 25-term box
 * sum — the same winner, and the same smoothed accumulator, on concentric synthetic cues.
 */
import { describe, expect, it } from 'vitest';
import { boxSum5, voteCentre } from '../../../src/core/segment/centreVote.js';
import type { EdgeCues } from '../../../src/core/segment/polar.js';
import { select } from '../../../src/core/measure/statistics.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function q(values: number[], p: number): number {
  const a = Float64Array.from(values);
  return select(a, Math.min(a.length - 1, Math.max(0, Math.round(p * (a.length - 1)))));
}

/** The vote as it was written before (kept here as the reference). */
function plainVote(cues: EdgeCues, rMin: number, rMax: number, near: { x: number; y: number }, nearRadius: number): { x: number; y: number; sm: Float32Array } {
  const { width: W, height: H } = cues;
  const aw = Math.ceil(W / 2);
  const ah = Math.ceil(H / 2);
  const acc = new Float32Array(aw * ah);
  for (const f of [cues.intensity, cues.roughness]) {
    const gm: number[] = [];
    const gxs = new Float32Array(W * H);
    const gys = new Float32Array(W * H);
    const step = 2;
    const sd = Math.max(1, Math.round(cues.windowPx / 4));
    for (let y = sd; y < H - sd; y += step) {
      for (let x = sd; x < W - sd; x += step) {
        const i = y * W + x;
        const gx = f[i + sd] - f[i - sd];
        const gy = f[i + sd * W] - f[i - sd * W];
        gxs[i] = gx;
        gys[i] = gy;
        gm.push(gx * gx + gy * gy);
      }
    }
    const thr = q(gm, 0.93);
    if (!(thr > 0)) continue;
    for (let y = sd; y < H - sd; y += step) {
      for (let x = sd; x < W - sd; x += step) {
        const i = y * W + x;
        const m2 = gxs[i] * gxs[i] + gys[i] * gys[i];
        if (m2 < thr) continue;
        const m = Math.sqrt(m2);
        const ux = gxs[i] / m;
        const uy = gys[i] / m;
        for (const s of [-1, 1]) {
          for (let r = rMin; r <= rMax; r += 1.5) {
            const px = x + s * ux * r;
            const py = y + s * uy * r;
            if (px < 0 || py < 0 || px >= W || py >= H) break;
            acc[(py >> 1) * aw + (px >> 1)] += 1;
          }
        }
      }
    }
  }
  const sm = new Float32Array(aw * ah);
  for (let y = 2; y < ah - 2; y++) {
    for (let x = 2; x < aw - 2; x++) {
      let s = 0;
      for (let dy = -2; dy <= 2; dy++) for (let dx = -2; dx <= 2; dx++) s += acc[(y + dy) * aw + x + dx];
      sm[y * aw + x] = s;
    }
  }
  let best = -1;
  let bx = near.x;
  let by = near.y;
  for (let y = 2; y < ah - 2; y++) {
    for (let x = 2; x < aw - 2; x++) {
      if (Math.hypot(2 * x - near.x, 2 * y - near.y) > nearRadius) continue;
      if (sm[y * aw + x] > best) {
        best = sm[y * aw + x];
        bx = 2 * x + 0.5;
        by = 2 * y + 0.5;
      }
    }
  }
  return { x: bx, y: by, sm };
}

/** Concentric steps of brightness and roughness around (cx, cy), with noise. */
function cues(W: number, H: number, cx: number, cy: number, seed: number, windowPx: number): EdgeCues {
  const rnd = lcg(seed);
  const intensity = new Float32Array(W * H);
  const roughness = new Float32Array(W * H);
  const R = 0.35 * Math.min(W, H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const r = Math.hypot(x - cx, y - cy);
      intensity[y * W + x] = (r < R ? 0.6 : 0.1) + (r < 0.6 * R ? 0.1 : 0) + 0.05 * rnd();
      roughness[y * W + x] = (r < 0.7 * R ? -1 : -3) + 0.3 * rnd();
    }
  }
  return { width: W, height: H, intensity, roughness, detailGx: new Float32Array(W * H), detailGy: new Float32Array(W * H), windowPx };
}

describe('voteCentre', () => {
  for (const [W, H, cx, cy, windowPx, seed] of [
    [160, 120, 83.3, 57.9, 5, 1],
    [201, 149, 70.2, 90.6, 7, 2],
    [120, 180, 61.1, 100.4, 9, 3],
    [97, 97, 20.5, 75.5, 5, 4], // centre near a corner: many votes leave the image
  ] as const) {
    it(`gives the plain vote's winner on a ${W}×${H} concentric scene`, () => {
      const c = cues(W, H, cx, cy, seed, windowPx);
      const minSide = Math.min(W, H);
      const near = { x: W / 2, y: H / 2 };
      const ref = plainVote(c, 0.1 * minSide, 0.6 * minSide, near, 0.45 * Math.max(W, H));
      const got = voteCentre(c, 0.1 * minSide, 0.6 * minSide, near, 0.45 * Math.max(W, H));
      expect(got).toEqual({ x: ref.x, y: ref.y });
      // the scene is one the vote resolves (2-px cells, 5-cell smoothing): it lands near the true centre
      expect(Math.hypot(got.x - cx, got.y - cy)).toBeLessThan(8);
    });
  }

  it('keeps to the given radius around `near` as the plain vote does (the best cell out of reach)', () => {
    const W = 160;
    const H = 120;
    const c = cues(W, H, 83.3, 57.9, 5, 5);
    for (const [near, radius] of [[{ x: 40, y: 30 }, 20], [{ x: 110, y: 80 }, 12.5], [{ x: 83, y: 58 }, 3], [{ x: 5, y: 5 }, 1]] as const) {
      const ref = plainVote(c, 12, 72, near, radius);
      const got = voteCentre(c, 12, 72, near, radius);
      expect(got).toEqual({ x: ref.x, y: ref.y });
      if (radius > 2) expect(Math.hypot(got.x - 0.5 - near.x, got.y - 0.5 - near.y)).toBeLessThanOrEqual(radius);
    }
  });

  it('boxSum5 equals the direct 25-term sum', () => {
    const rnd = lcg(9);
    const aw = 23;
    const ah = 17;
    const acc = Int32Array.from({ length: aw * ah }, () => Math.floor(rnd() * 5000));
    const sm = boxSum5(acc, aw, ah);
    for (let y = 0; y < ah; y++) {
      for (let x = 0; x < aw; x++) {
        let s = 0;
        if (y >= 2 && y < ah - 2 && x >= 2 && x < aw - 2) for (let dy = -2; dy <= 2; dy++) for (let dx = -2; dx <= 2; dx++) s += acc[(y + dy) * aw + x + dx];
        expect(sm[y * aw + x]).toBe(s);
      }
    }
  });
});
