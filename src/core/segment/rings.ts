/**
 * Closed, roughly concentric edges around a centre (the "rings" the fracture-edge search chooses
 * from): a centre vote, the radial edge-strength map on the polar grid, its peaks, a closed path
 * through each peak by dynamic programming, and the statistics of the annuli either side of each path.
 *
 * Method (our own, common practice in polar edge tracing; no source):
 * 1. Centre: every pixel with a strong intensity or roughness gradient votes along its gradient line
 *    (both ways, radii 0.15–1.4 × the silhouette radius) into an accumulator at half resolution;
 *    concentric edges (notch root, bar edge, rim/core boundary) all vote for their common centre
 *    (centreVote.ts).
 * 2. Edge strength e(θ, r): the radial steps of intensity (±1 px) and roughness (± half a window),
 *    each divided by its 90th percentile over the grid, the larger of the two, averaged over ±2 rays
 *    (edges are concentric, texture is not).
 * 3. Peaks of the angular mean of e(r) separated by max(4 px, 2.5 % of r); for each, the closed path of
 *    largest summed e within a band around it (radius change ≤ 1 px per ray), traced over 1.5 turns
 *    and kept in the middle.
 * 4. Per path: coverage (fraction of rays where e is a clear local maximum), prominence, roundness
 *    (RMS distance from its fitted ellipse), and for the annuli just inside and outside it: mean
 *    roughness and intensity, the radial share of fine-texture gradient energy (concentric turning marks
 *    → near 1, isotropic fracture relief → about 0.5), the concentricity of the detrended radial
 *    intensity profiles across 12 sectors (common to all sectors → 1, independent → about 1/12) and the
 *    fraction inside the part's silhouette.
 */
import type { PointPx } from '../image/geometry.js';
import type { Mask } from '../image/raster.js';
import type { EdgeCues, PolarCues, PolarShape } from './polar.js';
import { polarPoint, samplePolar } from './polar.js';
import { annulus, type AnnulusStats } from './annulus.js';

export type { AnnulusStats };
import { fitEllipseToPoints } from './fit.js';
import { valueAtRank as q } from '../measure/statistics.js';

/** One closed edge around the centre. */
export interface Ring {
  /** Mean radius, px. */
  radiusPx: number;
  /** The path on the polar grid (radius sample per ray). */
  path: Int32Array;
  /** Points of the path, working px, one per ray. */
  points: PointPx[];
  coverage: number;
  /** 1 on the rays where the path is a clear local maximum of the edge strength (the covered arcs). */
  covered: Uint8Array;
  prominence: number;
  roundnessPx: number;
  /** Signed mean steps across the edge (outside − inside): intensity and roughness. */
  intensityStep: number;
  roughnessStep: number;
  inner: AnnulusStats;
  outer: AnnulusStats;
}

/** The polar map with its edge strength, and the rings found on it. */
export interface RingSearch {
  shape: PolarShape;
  polar: PolarCues;
  rings: Ring[];
  /** Median edge strength over the grid (noise level of e). */
  noise: number;
  /** Mean roughness of the central disc (radii 0.1–0.4 of the most prominent clear ring): the core's level. */
  coreRoughness: number;
}

/** Edge strength on the polar grid (step 2). */
function edgeStrength(p: PolarCues, windowPx: number): Float32Array {
  const { nTheta, nR, dr } = p;
  const sI = Math.max(1, Math.round(1 / dr));
  const sR = Math.max(1, Math.round(windowPx / 2 / dr));
  const dI = new Float32Array(nTheta * nR);
  const dR = new Float32Array(nTheta * nR);
  const vi: number[] = [];
  const vr: number[] = [];
  for (let t = 0; t < nTheta; t++) {
    const o = t * nR;
    for (let j = sR; j < nR - sR; j++) {
      const k = o + j;
      if (!p.inside[k - sR] || !p.inside[k + sR]) continue;
      const a = Math.abs(p.intensity[k + sI] - p.intensity[k - sI]);
      const b = Math.abs(p.roughness[k + sR] - p.roughness[k - sR]);
      dI[k] = a;
      dR[k] = b;
      if ((j & 3) === 0) {
        vi.push(a);
        vr.push(b);
      }
    }
  }
  // each step relative to the mean step within ±8 px along the same ray (plus a global floor), so an
  // edge between two smooth surfaces counts as much as one beside rough texture
  const fi = q(vi, 0.5) || 1e-6;
  const fr = q(vr, 0.5) || 1e-6;
  const L = Math.max(2, Math.round(8 / dr));
  const e0 = new Float32Array(nTheta * nR);
  const ci = new Float64Array(nR + 1);
  const cr = new Float64Array(nR + 1);
  for (let t = 0; t < nTheta; t++) {
    const o = t * nR;
    for (let j = 0; j < nR; j++) {
      ci[j + 1] = ci[j] + dI[o + j];
      cr[j + 1] = cr[j] + dR[o + j];
    }
    for (let j = 0; j < nR; j++) {
      const a = Math.max(0, j - L);
      const b = Math.min(nR, j + L + 1);
      const mi = (ci[b] - ci[a]) / (b - a);
      const mr = (cr[b] - cr[a]) / (b - a);
      e0[o + j] = Math.max(dI[o + j] / (mi + fi), dR[o + j] / (mr + fr));
    }
  }
  const e = new Float32Array(nTheta * nR);
  for (let t = 0; t < nTheta; t++) {
    for (let j = 0; j < nR; j++) {
      let s = 0;
      for (let d = -2; d <= 2; d++) s += e0[((t + d + nTheta) % nTheta) * nR + j];
      e[t * nR + j] = s / 5;
    }
  }
  return e;
}

/** Closed path of largest summed strength in [lo, hi] (samples), ≤ 1 px radius change per ray (step 3). */
function tracePath(e: Float32Array, nTheta: number, nR: number, lo: number, hi: number, maxJump: number): Int32Array {
  const width = hi - lo + 1;
  const turns = Math.round(nTheta * 1.5);
  const score = new Float64Array(width);
  const back = new Int32Array(turns * width);
  for (let i = 0; i < width; i++) score[i] = e[lo + i];
  const next = new Float64Array(width);
  for (let s = 1; s < turns; s++) {
    const t = s % nTheta;
    for (let i = 0; i < width; i++) {
      let b = -Infinity;
      let bi = i;
      for (let d = -maxJump; d <= maxJump; d++) {
        const ii = i + d;
        if (ii < 0 || ii >= width) continue;
        const v = score[ii] - 0.05 * Math.abs(d);
        if (v > b) {
          b = v;
          bi = ii;
        }
      }
      next[i] = b + e[t * nR + lo + i];
      back[s * width + i] = bi;
    }
    score.set(next);
  }
  let bi = 0;
  for (let i = 1; i < width; i++) if (score[i] > score[bi]) bi = i;
  const path = new Int32Array(turns);
  for (let s = turns - 1; s >= 0; s--) {
    path[s] = bi;
    if (s > 0) bi = back[s * width + bi];
  }
  const out = new Int32Array(nTheta);
  const start = turns - nTheta;
  for (let s = start; s < turns; s++) out[s % nTheta] = lo + path[s];
  return out;
}

/** Options of {@link findRings}. */
export interface RingOptions {
  /** Largest radius searched, px (major-axis scale). */
  rMax: number;
  /** Smallest radius searched, px. */
  rMin: number;
  nTheta?: number;
  /** The part's silhouette (working px), for the in-silhouette fractions. */
  silhouette: Mask | null;
  /** At most this many rings, strongest first (default 7). */
  maxRings?: number;
}

/**
 * Finds the closed edges around `shape.center` (steps 2–4 of the module comment), inner first.
 */
export function findRings(cues: EdgeCues, shape: PolarShape, o: RingOptions): RingSearch {
  const nTheta = o.nTheta ?? 180;
  const dr = 0.5;
  const p = samplePolar(cues, shape, nTheta, o.rMax, dr);
  const { nR } = p;
  const e = edgeStrength(p, cues.windowPx);
  const all: number[] = [];
  for (let k = 0; k < e.length; k += 7) if (p.inside[k]) all.push(e[k]);
  const noise = q(all, 0.5) || 1e-6;
  // angular mean profile, smoothed over ±1 px
  const prof = new Float64Array(nR);
  for (let j = 0; j < nR; j++) {
    let s = 0;
    let c = 0;
    for (let t = 0; t < nTheta; t++) {
      const k = t * nR + j;
      if (!p.inside[k]) continue;
      s += Math.min(e[k], 4);
      c++;
    }
    prof[j] = c > nTheta * 0.25 ? s / c : 0;
  }
  const sm = new Float64Array(nR);
  for (let j = 0; j < nR; j++) {
    let s = 0;
    let c = 0;
    for (let d = -2; d <= 2; d++) {
      const jj = j + d;
      if (jj < 0 || jj >= nR) continue;
      s += prof[jj];
      c++;
    }
    sm[j] = s / c;
  }
  const jMin = Math.ceil(o.rMin / dr);
  const peaks: number[] = [];
  for (let j = Math.max(jMin, 2); j < nR - 2; j++) if (sm[j] > sm[j - 1] && sm[j] >= sm[j + 1] && sm[j] > 1.1 * noise) peaks.push(j);
  peaks.sort((a, b) => sm[b] - sm[a]);
  const kept: number[] = [];
  for (const j of peaks) {
    const r = j * dr;
    const sep = Math.max(4, 0.025 * r) / dr;
    if (kept.every((k) => Math.abs(k - j) >= sep)) kept.push(j);
    if (kept.length >= (o.maxRings ?? 7)) break;
  }
  kept.sort((a, b) => a - b);
  const traced: TracedRing[] = [];
  for (let i = 0; i < kept.length; i++) {
    const j = kept[i];
    const r = j * dr;
    const half = Math.max(4, 0.04 * r) / dr;
    const lo = Math.max(jMin, Math.round(Math.max(j - half, i > 0 ? (kept[i - 1] + j) / 2 + 1 : 0)));
    const hi = Math.min(nR - 3, Math.round(Math.min(j + half, i < kept.length - 1 ? (kept[i + 1] + j) / 2 - 1 : nR)));
    if (hi - lo < 2) continue;
    const path = tracePath(e, nTheta, nR, lo, hi, Math.max(1, Math.round(1 / dr)));
    traced.push(tracedRing(p, e, path, shape, cues.windowPx, noise));
  }
  // the annuli either side reach at most half-way to the neighbouring clear rings (found on half
  // the rays or more), so an annulus describes one surface, not the next one too. They are the only
  // part of a ring that depends on its neighbours: worked out once, after all rings are traced
  // (issue 16; was: every ring in full with unbounded annuli, then again with these gaps — the same
  // rings, the traced part computed twice)
  const clear = traced.map((r) => r.coverage >= 0.5);
  const rings: Ring[] = [];
  for (let i = 0; i < traced.length; i++) {
    let a = i - 1;
    while (a >= 0 && !clear[a]) a--;
    let b = i + 1;
    while (b < traced.length && !clear[b]) b++;
    const gapIn = a >= 0 ? traced[i].radiusPx - traced[a].radiusPx : Infinity;
    const gapOut = b < traced.length ? traced[b].radiusPx - traced[i].radiusPx : Infinity;
    rings.push(withAnnuli(p, traced[i], shape, cues.windowPx, o.silhouette, gapIn, gapOut));
  }
  let ref = -1;
  for (let i = 0; i < rings.length; i++) if (rings[i].coverage >= 0.5 && (ref < 0 || rings[i].prominence > rings[ref].prominence)) ref = i;
  const rRef = ref >= 0 ? rings[ref].radiusPx : o.rMax / 2;
  let cs = 0;
  let cn = 0;
  for (let t = 0; t < nTheta; t++) {
    for (let j = Math.floor((0.1 * rRef) / dr); j <= Math.ceil((0.4 * rRef) / dr) && j < nR; j++) {
      const k = t * nR + j;
      if (!p.inside[k]) continue;
      cs += p.roughness[k];
      cn++;
    }
  }
  return { shape, polar: p, rings, noise, coreRoughness: cn ? cs / cn : NaN };
}

/** A ring without its annuli: everything that follows from its own path. */
type TracedRing = Omit<Ring, 'inner' | 'outer'>;

/** The ring of `path`: radius, points, coverage, prominence, roundness and the steps across it. */
function tracedRing(p: PolarCues, e: Float32Array, path: Int32Array, shape: PolarShape, windowPx: number, noise: number): TracedRing {
  const { nTheta, nR, dr } = p;
  let sumRadius = 0;
  const points: PointPx[] = [];
  let covered = 0;
  const coveredRays = new Uint8Array(nTheta);
  let strength = 0;
  let around = 0;
  let di = 0;
  let dRs = 0;
  let nInside = 0;
  const sI = Math.max(1, Math.round(2 / dr));
  const sR = Math.max(2, Math.round(windowPx / dr));
  for (let t = 0; t < nTheta; t++) {
    const j = path[t];
    sumRadius += j * dr;
    points.push(polarPoint(shape, (2 * Math.PI * t) / nTheta, j * dr));
    const k = t * nR + j;
    if (!p.inside[k]) continue;
    nInside++;
    strength += e[k];
    // local maximum and clearly above the noise
    let mx = 0;
    for (let d = 3; d <= 10; d++) {
      if (j + d < nR) mx = Math.max(mx, e[k + d]);
      if (j - d >= 0) mx = Math.max(mx, e[k - d]);
    }
    if (e[k] > 2 * noise && e[k] >= mx) {
      covered++;
      coveredRays[t] = 1;
    }
    around += mx;
    if (j - sR >= 0 && j + sR < nR && p.inside[k + sR] && p.inside[k - sR]) {
      di += p.intensity[k + sI] - p.intensity[k - sI];
      dRs += p.roughness[k + sR] - p.roughness[k - sR];
    }
  }
  const fit = fitEllipseToPoints(points);
  return {
    radiusPx: sumRadius / nTheta,
    path,
    points,
    coverage: nTheta ? covered / nTheta : 0,
    covered: coveredRays,
    prominence: nInside ? (strength - around) / nInside / Math.max(noise, 1e-6) : 0,
    roundnessPx: fit ? fit.rmsResidualPx : Infinity,
    intensityStep: nInside ? di / nInside : 0,
    roughnessStep: nInside ? dRs / nInside : 0,
  };
}

/**
 * The ring with the annuli just inside and outside it, each at most `w` wide and reaching at most
 * half-way to the neighbouring clear ring `gapInPx` / `gapOutPx` away (Infinity: none).
 */
function withAnnuli(p: PolarCues, r: TracedRing, shape: PolarShape, windowPx: number, silhouette: Mask | null, gapInPx: number, gapOutPx: number): Ring {
  const { dr } = p;
  const w = Math.max(3, Math.min(0.06 * r.radiusPx, 6 * windowPx)) / dr;
  const gap = Math.round(Math.max(2, windowPx / 2 / dr));
  // keep clear of the neighbouring ring by its own blur (band-pass σ 2 px leaks ~6 px)
  const margin = Math.max(gap, Math.round(6 / dr));
  const wIn = Math.max(2, Math.min(w, gapInPx / dr - gap - margin));
  const wOut = Math.max(2, Math.min(w, gapOutPx / dr - gap - margin));
  return {
    ...r,
    inner: annulus(p, r.path, -gap, -gap - Math.round(wIn), silhouette, shape),
    outer: annulus(p, r.path, gap, gap + Math.round(wOut), silhouette, shape),
  };
}
