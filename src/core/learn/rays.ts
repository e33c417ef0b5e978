/**
 * Ray helpers of the model branch (learn/segment.ts): the ½-crossings of a plane along each ray near a line and the matched step of the core probability (`coreStep`) that guides the boundary.
 */
import type { PointPx } from '../image/geometry.js';
import { buildRayIndex, castRay, rayDirection } from '../measure/geometry.js';
import { samplePlane } from '../segment/refine.js';

/**
 * Along rays from `centre`: where `v` crosses ½ nearest the radius of `line` on the ray, within
 * ±search px, going from below ½ (inside) to above (outside) when `rising`, else the reverse.
 * Null where the line misses the ray or no crossing lies in range (the line's radius is used then
 * when `fallback`).
 */
export function crossings(v: Float32Array, W: number, H: number, centre: PointPx, line: readonly PointPx[], nRays: number, search: number, rising: boolean): (number | null)[] {
  const idx = buildRayIndex(line, centre);
  const out: (number | null)[] = [];
  const step = 0.25;
  for (let i = 0; i < nRays; i++) {
    const th = (360 * i) / nRays;
    const hits = castRay(idx, th);
    if (!hits.length) {
      out.push(null);
      continue;
    }
    const c = hits[hits.length - 1];
    const d = rayDirection(th);
    const at = (t: number): number => samplePlane(v, W, H, centre.x + t * d.x, centre.y + t * d.y) - 0.5;
    let best: number | null = null;
    let prev = at(Math.max(0, c - search));
    for (let t = Math.max(0, c - search) + step; t <= c + search + 1e-9; t += step) {
      const cur = at(t);
      if (rising ? prev < 0 && cur >= 0 : prev >= 0 && cur < 0) {
        const tc = t - step + step * (prev / (prev - cur));
        if (best === null || Math.abs(tc - c) < Math.abs(best - c)) best = tc;
      }
      prev = cur;
    }
    out.push(best ?? c);
  }
  return out;
}

/**
 * Along each ray from `centre`: the radius r within ±search of the coarse line (and at least half a
 * window inside the outer edge) that best separates the core probability q into core inside and
 * rim outside: the largest mean of q over [r − w, r] and of 1 − q over [r, r + w] (w cut at the
 * outer edge). A matched step on the probability: a patch of the band the model half takes for core
 * (q ≈ 0.3) next to the core scores less than the true step, and a dark blob of the core reaching the
 * band does not move the step outward.
 */
export function coreStep(q: Float32Array, W: number, H: number, centre: PointPx, coarse: readonly PointPx[], outer: (number | null)[], nRays: number, w: number, search: number): (number | null)[] {
  const idx = buildRayIndex(coarse, centre);
  const out: (number | null)[] = [];
  const step = 0.5;
  const k = Math.max(1, Math.round(w / step));
  for (let i = 0; i < nRays; i++) {
    const th = (360 * i) / nRays;
    const hits = castRay(idx, th);
    const o = outer[i];
    if (!hits.length || o === null) {
      out.push(null);
      continue;
    }
    const c = Math.min(hits[hits.length - 1], o - 0.5 * w);
    const d = rayDirection(th);
    const t0 = Math.max(0, c - search - w);
    const t1 = o;
    const n = Math.max(2, Math.floor((t1 - t0) / step) + 1);
    const cum = new Float64Array(n + 1);
    for (let j = 0; j < n; j++) {
      const t = t0 + j * step;
      cum[j + 1] = cum[j] + samplePlane(q, W, H, centre.x + t * d.x, centre.y + t * d.y);
    }
    let best = -Infinity;
    let bestT = c;
    const jLo = Math.max(1, Math.ceil((c - search - t0) / step));
    const jHi = Math.min(n - 2, Math.floor((Math.min(c + search, o - 0.5 * w) - t0) / step));
    for (let j = jLo; j <= jHi; j++) {
      const a = Math.max(0, j - k);
      const b = Math.min(n, j + k);
      const score = (cum[j] - cum[a]) / (j - a) + 1 - (cum[b] - cum[j]) / (b - j);
      const t = t0 + j * step;
      if (score > best + 1e-9 || (Math.abs(score - best) <= 1e-9 && Math.abs(t - c) < Math.abs(bestT - c))) {
        best = score;
        bestT = t;
      }
    }
    out.push(bestT);
  }
  return out;
}
