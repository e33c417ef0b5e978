/**
 * Step 1 of the fracture-edge search (rings.ts module comment): the common centre of concentric
 * edges, voted for by gradient rays on a grid of samples of the working copy (split from rings.ts).
 */
import type { PointPx } from '../image/geometry.js';
import type { EdgeCues } from './polar.js';
import { valueAtRank as q } from '../measure/statistics.js';

/**
 * Votes for the common centre of concentric edges (step 1 of the module comment).
 * @param rMin, rMax - vote distances, px
 * @param near - restrict the winner to within `nearRadius` of this point (the silhouette centre)
 */
export function voteCentre(cues: EdgeCues, rMin: number, rMax: number, near: PointPx, nearRadius: number): PointPx {
  const { width: W, height: H } = cues;
  const aw = Math.ceil(W / 2);
  const ah = Math.ceil(H / 2);
  // vote counts are whole numbers far below 2^24: integer counts are what a float accumulator held
  const acc = new Int32Array(aw * ah);
  const step = 2;
  const sd = Math.max(1, Math.round(cues.windowPx / 4));
  for (const f of [cues.intensity, cues.roughness]) {
    const g = sampledGradients(f, W, H, sd, step);
    const thr = q(g.m2, 0.93);
    if (!(thr > 0)) continue;
    castVotes(acc, aw, W, H, g, thr, rMin, rMax);
  }
  const sm = boxSum5(acc, aw, ah);
  const at = bestCell(sm, aw, ah, near, nearRadius);
  return at < 0 ? { x: near.x, y: near.y } : { x: 2 * (at % aw) + 0.5, y: 2 * Math.floor(at / aw) + 0.5 };
}

/**
 * The first cell in row order with the largest sum among those within `nearRadius` of `near`
 * (accumulator cells at twice their index), or −1. The distance is worked out only for a cell
 * that would beat the best so far (issue 16: was one Math.hypot per cell, ≈ 270 000); the same
 * cell: a cell is taken exactly when it is near and beats the best so far, in either order of
 * the two tests. A loop of its own.
 */
function bestCell(sm: Float32Array, aw: number, ah: number, near: PointPx, nearRadius: number): number {
  let best = -1;
  let at = -1;
  for (let y = 2; y < ah - 2; y++) {
    for (let x = 2, i = y * aw + 2; x < aw - 2; x++, i++) {
      if (sm[i] > best && !(Math.hypot(2 * x - near.x, 2 * y - near.y) > nearRadius)) {
        best = sm[i];
        at = i;
      }
    }
  }
  return at;
}

/** Central-difference gradients at every `step`-th pixel (row-major order of the grid). */
interface SampledGradients {
  /** Pixel coordinates of each sample. */
  xs: Int32Array;
  ys: Int32Array;
  /** The gradient as stored (float32). */
  gx: Float32Array;
  gy: Float32Array;
  /** gx² + gy² of the unrounded (float64) differences: the values the vote threshold is the quantile of. */
  m2: Float64Array;
}

/**
 * The gradients of `f` on the vote grid. Only the grid samples are kept (was: two full-size
 * float32 rasters and a number[] of the squared magnitudes) — the same values in the same order.
 */
export function sampledGradients(f: Float32Array, W: number, H: number, sd: number, step: number): SampledGradients {
  const nx = W - sd > sd ? Math.ceil((W - 2 * sd) / step) : 0;
  const ny = H - sd > sd ? Math.ceil((H - 2 * sd) / step) : 0;
  const n = nx * ny;
  const out: SampledGradients = { xs: new Int32Array(n), ys: new Int32Array(n), gx: new Float32Array(n), gy: new Float32Array(n), m2: new Float64Array(n) };
  let k = 0;
  for (let y = sd; y < H - sd; y += step) {
    for (let x = sd; x < W - sd; x += step) {
      const i = y * W + x;
      const gx = f[i + sd] - f[i - sd];
      const gy = f[i + sd * W] - f[i - sd * W];
      out.xs[k] = x;
      out.ys[k] = y;
      out.gx[k] = gx;
      out.gy[k] = gy;
      out.m2[k] = gx * gx + gy * gy;
      k++;
    }
  }
  return out;
}

/**
 * Each sample whose stored gradient has m² ≥ thr votes along its gradient line, both ways, at
 * r = rMin, rMin + 1.5, … ≤ rMax until the line leaves the image, into the half-resolution
 * accumulator. The same points as `x + s·ux·r` with s = ±1 (a sign flip is exact); the order of
 * the increments does not matter to integer counts. A loop of its own, one direction at a time:
 * ≈ 23 M votes on the 12-MP bench image, where the loop inside `voteCentre` with a float
 * accumulator cost ≈ 280 ms of a profile.
 */
function castVotes(acc: Int32Array, aw: number, W: number, H: number, g: SampledGradients, thr: number, rMin: number, rMax: number): void {
  for (let k = 0; k < g.m2.length; k++) {
    const gx = g.gx[k];
    const gy = g.gy[k];
    const m2 = gx * gx + gy * gy;
    if (m2 < thr) continue;
    const m = Math.sqrt(m2);
    const ux = gx / m;
    const uy = gy / m;
    voteRay(acc, aw, W, H, g.xs[k], g.ys[k], -ux, -uy, rMin, rMax);
    voteRay(acc, aw, W, H, g.xs[k], g.ys[k], ux, uy, rMin, rMax);
  }
}

function voteRay(acc: Int32Array, aw: number, W: number, H: number, x: number, y: number, ux: number, uy: number, rMin: number, rMax: number): void {
  for (let r = rMin; r <= rMax; r += 1.5) {
    const px = x + ux * r;
    const py = y + uy * r;
    if (px < 0 || py < 0 || px >= W || py >= H) break;
    acc[(py >> 1) * aw + (px >> 1)]++;
  }
}

/**
 * 5 × 5 box sums of the counts (0 within 2 px of the border), as a row pass then a column pass:
 * sums of whole numbers below 2^24 are exact in any order, so this equals the direct 25-term sum.
 */
export function boxSum5(acc: Int32Array, aw: number, ah: number): Float32Array {
  const rows = new Int32Array(aw * ah);
  for (let y = 0; y < ah; y++) {
    const o = y * aw;
    for (let x = 2; x < aw - 2; x++) rows[o + x] = acc[o + x - 2] + acc[o + x - 1] + acc[o + x] + acc[o + x + 1] + acc[o + x + 2];
  }
  const sm = new Float32Array(aw * ah);
  for (let y = 2; y < ah - 2; y++) {
    const o = y * aw;
    for (let x = 2; x < aw - 2; x++) sm[o + x] = rows[o + x - 2 * aw] + rows[o + x - aw] + rows[o + x] + rows[o + x + aw] + rows[o + x + 2 * aw];
  }
  return sm;
}
