/**
 * Per-sector thresholds of the rim/core classification (rimCore.ts): besides the global Otsu threshold,
 * each of 12 angular sectors gets its own where that split is clearly better (constants below; our
 * choice, tuned on the rendered scene set, no source).
 */
import type { PointPx } from '../image/geometry.js';
import { otsuThreshold } from './cvutil.js';
import { meanVar, splitSums } from './rimCoreLoops.js';

/** Number of angular sectors of the per-sector threshold. */
const N_SECTORS = 12;
/** Otsu's η a sector needs for its own threshold (one Gaussian gives ≈ 0.64; our choice, tuned on rendered scenes). */
const SECTOR_MIN_ETA = 0.55;
/** Smallest share of each class in a sector for its own threshold. */
const SECTOR_MIN_CLASS = 0.08;
/**
 * How much farther out (as a fraction of the sector's largest interior radius) the smooth class of a
 * sector must lie on average than its rough class for the sector's own threshold to be used: the
 * smooth rim lies outside the rough core; a split of a sector without that order (no band there, or
 * noise) is not a rim/core split.
 */
const SECTOR_MIN_RADIAL_ORDER = 0.06;
/**
 * How much the sector's own threshold must raise Otsu's η on that sector over the global threshold:
 * where the global one splits the sector about as well, it is kept (so an image evenly lit and sharp
 * is classified exactly as with one threshold).
 */
const SECTOR_MIN_ETA_GAIN = 0.035;

/** Sector position (0 … N_SECTORS, fractional, sector centres at k + 0.5) and radius (feature px) of every interior pixel. */
export function sectorPositions(idx: Int32Array, fw: number, centre: PointPx): { pos: Float32Array; rad: Float32Array } {
  const pos = new Float32Array(idx.length);
  const rad = new Float32Array(idx.length);
  positionsInto(idx, fw, centre.x, centre.y, pos, rad);
  return { pos, rad };
}

/**
 * The loop of {@link sectorPositions}, with the centre and 2π as locals: the interior's first rows
 * (above the centre) all have angles ≥ 0, so V8 optimised the loop before the `a < 0` branch had
 * run and fell back to the interpreter half-way (`--trace-deopt`). The same operations.
 */
function positionsInto(idx: Int32Array, fw: number, cx: number, cy: number, pos: Float32Array, rad: Float32Array): void {
  const twoPi = 2 * Math.PI;
  const k = N_SECTORS / twoPi;
  for (let i = 0; i < idx.length; i++) {
    const x = (idx[i] % fw) - cx;
    const y = cy - Math.floor(idx[i] / fw);
    const a = Math.atan2(y, x);
    pos[i] = (a < 0 ? a + twoPi : a) * k;
    rad[i] = hypot2(x, y);
  }
}

/**
 * Math.hypot(x, y) for finite x, y, computed as V8's builtin does (Node 20, V8 11: the largest
 * magnitude m, the Kahan-compensated sum of (|x|/m)² and (|y|/m)², √sum · m): Math.hypot is a call
 * into a variadic builtin that V8 does not inline (≈ 45 ns against ≈ 12 ns, 430 000 interior pixels
 * per classification). tests/core/segment/rimCoreLoops.test.ts checks it equals Math.hypot bit for
 * bit on the pixel grids and on random values; should a Node update change Math.hypot, that test
 * says so (the result would then stay as it is now).
 */
export function hypot2(x: number, y: number): number {
  const ax = Math.abs(x);
  const ay = Math.abs(y);
  let max = 0;
  if (ax > max) max = ax;
  if (ay > max) max = ay;
  if (max === 0) return 0;
  let sum = 0;
  let comp = 0;
  const n1 = ax / max;
  const s1 = n1 * n1 - comp;
  let pre = sum + s1;
  comp = pre - sum - s1;
  sum = pre;
  const n2 = ay / max;
  const s2 = n2 * n2 - comp;
  pre = sum + s2;
  sum = pre;
  return Math.sqrt(sum) * max;
}

/** Otsu's threshold of one sector's values, its η, the share above it, and the mean radii below and above it. */
function etaAt(vals: Float32Array, t: number, mAll: number, vAll: number): [number, number, number] {
  const q = splitSums(vals, t);
  const sa = q[0];
  const na = q[1];
  const sb = q[2];
  const nb0 = vals.length - na;
  return [vAll > 0 && na && nb0 ? ((na / vals.length) * (sa / na - mAll) ** 2 + (nb0 / vals.length) * (sb / nb0 - mAll) ** 2) / vAll : 0, na, nb0];
}

/**
 * [Σ rad where v > t, Σ rad where v ≤ t, max rad], without branches in the loop (see
 * rimCoreLoops.ts `meanVar`; the radii are ≥ 0, the sums start at +0, so adding 0 changes nothing).
 */
function radialSums(vals: Float32Array, rad: Float32Array, t: number): Float64Array {
  const out = new Float64Array(3);
  radialSumsInto(vals, rad, t, out);
  return out;
}

/** The loop of {@link radialSums}, its sums into out (not an array literal: see rimCoreLoops.ts `splitSums`). */
function radialSumsInto(vals: Float32Array, rad: Float32Array, t: number, out: Float64Array): void {
  let rA = 0;
  let rB = 0;
  let rMax = 0;
  for (let i = 0; i < vals.length; i++) {
    const r = rad[i];
    const above = vals[i] > t;
    rA += above ? r : 0;
    rB += above ? 0 : r;
    rMax = r > rMax ? r : rMax;
  }
  out[0] = rA;
  out[1] = rB;
  out[2] = rMax;
}

function sectorSplit(vals: Float32Array, rad: Float32Array, lo: number, hi: number, tGlobal: number): { t: number; eta: number; gain: number; above: number; order: number } {
  const t = otsuThreshold(vals, lo, hi);
  const [mAll, vAll] = meanVar(vals);
  const [eta, na, nb0] = etaAt(vals, t, mAll, vAll);
  const gain = eta - etaAt(vals, tGlobal, mAll, vAll)[0];
  const q = radialSums(vals, rad, t);
  const rA = q[0];
  const rB = q[1];
  const rMax = q[2];
  const order = na && nb0 && rMax > 0 ? (rB / nb0 - rA / na) / rMax : 0;
  return { t, eta, gain, above: vals.length ? na / vals.length : 0, order };
}

/**
 * Per-sector thresholds: Otsu's threshold of each of N_SECTORS angular sectors where that sector is
 * split into a rough inner and a smooth outer class (η ≥ SECTOR_MIN_ETA, each class ≥
 * SECTOR_MIN_CLASS, the smooth class farther out by SECTOR_MIN_RADIAL_ORDER), else the global one.
 * Under a light that darkens one side (signal-independent noise then reads as roughness there) or a
 * one-sided defocus (the core reads smoother there) one global threshold cuts the wrong class in
 * part of the circumference; the sector's own split follows it.
 */
export function sectorThresholds(comb: Float32Array, idx: Int32Array, pos: Float32Array, rad: Float32Array, split: { t: number; lo: number; hi: number }): Float64Array {
  // each sector's values and radii in interior order, one after the other in two flat arrays (a counting sort)
  const sec = new Uint8Array(pos.length);
  const start = sectorStarts(pos, sec);
  const flatVals = new Float32Array(pos.length);
  const flatRads = new Float32Array(pos.length);
  fillSectors(comb, idx, rad, sec, start, flatVals, flatRads);
  const vals: Float32Array[] = [];
  const rads: Float32Array[] = [];
  for (let s = 0; s < N_SECTORS; s++) {
    vals.push(flatVals.subarray(start[s], start[s + 1]));
    rads.push(flatRads.subarray(start[s], start[s + 1]));
  }
  const ts = new Float64Array(N_SECTORS);
  for (let s = 0; s < N_SECTORS; s++) {
    const o = vals[s].length > 50 ? sectorSplit(vals[s], rads[s], split.lo, split.hi, split.t) : null;
    const own = o !== null && o.eta >= SECTOR_MIN_ETA && o.above >= SECTOR_MIN_CLASS && o.above <= 1 - SECTOR_MIN_CLASS && o.order >= SECTOR_MIN_RADIAL_ORDER && o.gain >= SECTOR_MIN_ETA_GAIN;
    ts[s] = own ? o.t : split.t;
  }
  return ts;
}

/** Each interior pixel's sector (into `sec`) and where each sector starts in the sector-ordered arrays (N_SECTORS + 1 offsets). */
function sectorStarts(pos: Float32Array, sec: Uint8Array): Int32Array {
  const start = new Int32Array(N_SECTORS + 1);
  for (let i = 0; i < pos.length; i++) {
    const s = Math.min(N_SECTORS - 1, Math.floor(pos[i]));
    sec[i] = s;
    start[s + 1]++;
  }
  for (let s = 0; s < N_SECTORS; s++) start[s + 1] += start[s];
  return start;
}

/** The values comb[idx[i]] and radii rad[i], sector by sector in interior order (loops of their own: see rimCoreLoops.ts `meanVar`). */
function fillSectors(comb: Float32Array, idx: Int32Array, rad: Float32Array, sec: Uint8Array, start: Int32Array, vals: Float32Array, rads: Float32Array): void {
  const next = Int32Array.from(start);
  for (let i = 0; i < sec.length; i++) {
    const o = next[sec[i]]++;
    rads[o] = rad[i];
    vals[o] = comb[idx[i]];
  }
}

/** out[idx[k]] = (v[idx[k]] > threshold interpolated between the sector centres at pos[k]). */
export function markAboveSectors(v: Float32Array, idx: Int32Array, pos: Float32Array, ts: Float64Array, out: Uint8Array): void {
  const n = ts.length;
  for (let k = 0; k < idx.length; k++) {
    const p = pos[k] - 0.5;
    const f = Math.floor(p);
    const w = p - f;
    const t = ts[(f + n) % n] * (1 - w) + ts[(f + 1) % n] * w;
    out[idx[k]] = v[idx[k]] > t ? 1 : 0;
  }
}
