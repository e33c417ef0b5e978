/**
 * The refinement phase of the scale-bar detection (see scaleBar.ts), at full resolution around one
 * candidate, in four steps: the across-bar profile gives the two long edges, thickness and levels
 * ({@link fitAcross}); per-column edges, interior and surroundings give straightness, uniformity and
 * quiet surroundings ({@link checkColumns}); the along profile gives the two ends and the length
 * ({@link findEnds}); the confidence is the product of the named factors of
 * {@link CONFIDENCE_FACTORS}.
 */
import type { GrayRaster } from '../image/raster.js';
import type { ScaleBar } from './scaleBar.js';
import { findLabel, findPlate } from './scaleBarMarks.js';
import { crossing, median, robustStd, type Candidate, type Ctx } from './scaleBarSearch.js';

const clamp01 = (v: number): number => (v <= 0 ? 0 : v >= 1 ? 1 : Number.isFinite(v) ? v : 0);

/** 0 at `start`, rising linearly to 1 at `start + width`. */
const rising = (v: number, start: number, width: number): number => clamp01((v - start) / width);
/** 1 at `start`, falling linearly to 0 at `start + width`. */
const falling = (v: number, start: number, width: number): number => clamp01(1 - (v - start) / width);

/** A candidate seen at full resolution: coordinates along (u) and across (v) the bar. */
interface BarView {
  raster: GrayRaster;
  horiz: boolean;
  /** Image extent along and across the bar, px. */
  Lu: number;
  Lv: number;
  /** Pixel value at (along, across). */
  get: (u: number, v: number) => number;
  /** +1 for a light bar, −1 for a dark one. */
  sign: number;
  /** Candidate extent along (px), its coarse thickness and across centre. */
  uA: number;
  uB: number;
  tC: number;
  vc: number;
  /** Width of the surrounding strips and their gap to the bar edge, px. */
  s: number;
  gap: number;
  /** Central 60 % of the length and the columns sampled in it. */
  cu0: number;
  cu1: number;
  cols: number[];
}

function viewOf(ctx: Ctx, c: Candidate, polarity: 'light' | 'dark'): BarView | null {
  const { raster, f, maxT } = ctx;
  const W = raster.width;
  const d = raster.data;
  const horiz = c.orientation === 'horizontal';
  const uA = (horiz ? c.left : c.top) * f;
  const uB = ((horiz ? c.left + c.bw : c.top + c.bh) * f) - 1;
  const lenC = uB - uA + 1;
  const tC = c.tW * f;
  const cu0 = Math.round(uA + 0.2 * lenC);
  const cu1 = Math.round(uB - 0.2 * lenC);
  const step = Math.max(1, Math.floor((cu1 - cu0 + 1) / 160));
  const cols: number[] = [];
  for (let u = cu0; u <= cu1; u += step) cols.push(u);
  if (cols.length < 3) return null;
  return {
    raster,
    horiz,
    Lu: horiz ? W : raster.height,
    Lv: horiz ? raster.height : W,
    get: horiz ? (u: number, v: number) => d[v * W + u] : (u: number, v: number) => d[u * W + v],
    sign: polarity === 'light' ? 1 : -1,
    uA,
    uB,
    tC,
    vc: (c.acrossStart + c.tW / 2) * f,
    s: Math.max(3, Math.ceil(Math.min(tC, maxT) / 2)),
    gap: 2,
    cu0,
    cu1,
    cols,
  };
}

/** The two long edges (absolute across positions), thickness and the bar / surrounding levels. */
interface AcrossFit {
  topAbs: number;
  botAbs: number;
  mid: number;
  thickness: number;
  inLevel: number;
  outA: number;
  outB: number;
  /** Contrast on either side and the weaker of the two. */
  cA: number;
  cB: number;
  contrast: number;
}

/** Per-row median over the sampled columns, the bar level at its peak, and the 50 % edges. */
function fitAcross(ctx: Ctx, b: BarView): AcrossFit | null {
  const { f, minT, maxT } = ctx;
  const { tC, vc, s, gap, sign, cols, get } = b;
  const R = Math.ceil(tC / 2 + f + gap + s + 3);
  const v0 = Math.max(0, Math.floor(vc - R));
  const v1 = Math.min(b.Lv - 1, Math.ceil(vc + R));
  const nv = v1 - v0 + 1;
  const prof = new Float64Array(nv);
  const tmp: number[] = new Array(cols.length);
  for (let k = 0; k < nv; k++) {
    for (let j = 0; j < cols.length; j++) tmp[j] = get(cols[j], v0 + k);
    prof[k] = median(tmp);
  }
  // peak (bar level) near the coarse centre
  const pk0 = Math.max(0, Math.floor(vc - tC / 2 - f - v0));
  const pk1 = Math.min(nv - 1, Math.ceil(vc + tC / 2 + f - v0));
  let peak = pk0;
  for (let k = pk0; k <= pk1; k++) if ((prof[k] - prof[peak]) * sign > 0) peak = k;
  const inLevel = prof[peak];
  let outA = prof[0];
  let outB = prof[nv - 1];
  let top = NaN;
  let bot = NaN;
  for (let iter = 0; iter < 2; iter++) {
    top = crossing(prof, peak, -1, (inLevel + outA) / 2, sign);
    bot = crossing(prof, peak, 1, (inLevel + outB) / 2, sign);
    if (!Number.isFinite(top) || !Number.isFinite(bot)) return null;
    const stripA: number[] = [];
    const stripB: number[] = [];
    for (let k = Math.floor(top - gap - s); k <= Math.floor(top - gap); k++) if (k >= 0) stripA.push(prof[k]);
    for (let k = Math.ceil(bot + gap); k <= Math.ceil(bot + gap + s); k++) if (k < nv) stripB.push(prof[k]);
    if (stripA.length === 0 || stripB.length === 0) return null; // touches the frame across
    outA = median(stripA);
    outB = median(stripB);
  }
  const thickness = bot - top;
  if (thickness < Math.min(1.5, minT) || thickness > maxT + 1) return null;
  const cA = sign * (inLevel - outA);
  const cB = sign * (inLevel - outB);
  if (!(cA > 0) || !(cB > 0)) return null;
  const topAbs = top + v0;
  const botAbs = bot + v0;
  return { topAbs, botAbs, mid: (topAbs + botAbs) / 2, thickness, inLevel, outA, outB, cA, cB, contrast: Math.min(cA, cB) };
}

/** Straightness, uniformity and surroundings over the central 60 %, and the rows inside the bar. */
interface ColumnChecks {
  /** Fraction of columns whose edge is missing or more than 1 px off the profile's edge. */
  edgeOutliers: number;
  /** Robust sd of the per-column edge positions, px. */
  edgeStd: number;
  /** Robust sd of the interior level over the contrast. */
  uni: number;
  /** Robust sd of the surrounding strips over the contrast. */
  sur: number;
  inRows: number[];
}

function checkColumns(b: BarView, a: AcrossFit): ColumnChecks {
  const { get, sign, s, gap } = b;
  const { topAbs, botAbs, mid, inLevel, outA, outB, contrast } = a;
  const tops: number[] = [];
  const bots: number[] = [];
  const inner: number[] = [];
  const surA: number[] = [];
  const surB: number[] = [];
  const cv0 = Math.max(0, Math.floor(topAbs - gap - s));
  const cv1 = Math.min(b.Lv - 1, Math.ceil(botAbs + gap + s));
  const colProf = new Float64Array(cv1 - cv0 + 1);
  const inRows: number[] = [];
  for (let v = Math.ceil(topAbs + 0.5); v <= Math.floor(botAbs - 0.5); v++) inRows.push(v);
  if (inRows.length === 0) inRows.push(Math.round(mid));
  const pkc = Math.round(mid) - cv0;
  const levelA = (inLevel + outA) / 2;
  const levelB = (inLevel + outB) / 2;
  for (const u of b.cols) {
    for (let v = cv0; v <= cv1; v++) colProf[v - cv0] = get(u, v);
    tops.push(crossing(colProf, pkc, -1, levelA, sign) + cv0);
    bots.push(crossing(colProf, pkc, 1, levelB, sign) + cv0);
    let m = 0;
    for (const v of inRows) m += get(u, v);
    inner.push(m / inRows.length);
    let sa = 0;
    let na = 0;
    for (let v = Math.floor(topAbs - gap - s); v <= Math.floor(topAbs - gap); v++) if (v >= 0) (sa += get(u, v)), na++;
    let sb = 0;
    let nb = 0;
    for (let v = Math.ceil(botAbs + gap); v <= Math.ceil(botAbs + gap + s); v++) if (v < b.Lv) (sb += get(u, v)), nb++;
    surA.push(sa / Math.max(1, na));
    surB.push(sb / Math.max(1, nb));
  }
  const badEdge = (arr: number[], ref: number): number => arr.filter((t) => !Number.isFinite(t) || Math.abs(t - ref) > 1).length / arr.length;
  return {
    edgeOutliers: Math.max(badEdge(tops, topAbs), badEdge(bots, botAbs)),
    edgeStd: Math.max(robustStd(tops.filter(Number.isFinite)), robustStd(bots.filter(Number.isFinite))),
    uni: robustStd(inner) / contrast,
    sur: Math.max(robustStd(surA), robustStd(surB)) / contrast,
    inRows,
  };
}

/** The two ends: 50 % crossings of the along profile (positions relative to u0), length and end sharpness. */
interface BarEnds {
  u0: number;
  left: number;
  right: number;
  lengthPx: number;
  /** Wider of the two 20–80 % end widths, px (NaN when an end has no clean 20/80 % crossing). */
  endW: number;
  outLevel: number;
}

function findEnds(ctx: Ctx, b: BarView, a: AcrossFit, inRows: number[]): BarEnds | null {
  const { get, sign, cu0, cu1 } = b;
  const midRows = inRows.length > 2 ? inRows.slice(Math.floor(inRows.length * 0.2), Math.ceil(inRows.length * 0.8)) : inRows;
  const pad = 2 * ctx.f + 4 + b.s;
  const u0 = Math.max(0, b.uA - pad);
  const u1 = Math.min(b.Lu - 1, b.uB + pad);
  const along = new Float64Array(u1 - u0 + 1);
  for (let u = u0; u <= u1; u++) {
    let m = 0;
    for (const v of midRows) m += get(u, v);
    along[u - u0] = m / midRows.length;
  }
  const centre: number[] = [];
  for (let u = cu0; u <= cu1; u++) centre.push(along[u - u0]);
  const inAlong = median(centre);
  const outLevel = (a.outA + a.outB) / 2;
  const lvl = (q: number): number => outLevel + q * (inAlong - outLevel);
  const sL = cu0 - u0;
  const sR = cu1 - u0;
  const left = crossing(along, sL, -1, lvl(0.5), sign);
  const right = crossing(along, sR, 1, lvl(0.5), sign);
  if (!Number.isFinite(left) || !Number.isFinite(right)) return null; // runs into the frame
  const lengthPx = right - left;
  if (lengthPx < ctx.minLenFrac * b.Lu || lengthPx < 8 * a.thickness) return null;
  const width2080 = (st: number, dir: 1 | -1): number => Math.abs(crossing(along, st, dir, lvl(0.2), sign) - crossing(along, st, dir, lvl(0.8), sign));
  return { u0, left, right, lengthPx, endW: Math.max(width2080(sL, -1), width2080(sR, 1)), outLevel };
}

/** What the confidence factors read. */
export interface ConfidenceInputs {
  /** Weaker-side contrast, gray levels 0..1, and both sides. */
  contrast: number;
  cA: number;
  cB: number;
  edgeStd: number;
  edgeOutliers: number;
  uni: number;
  sur: number;
  endW: number;
  /** Distance of the bar centre to the nearest image side, as a fraction of that side. */
  margin: number;
  hasLabel: boolean;
}

/** One factor of the confidence: its name, what it rewards, and its score 0..1. */
export interface ConfidenceFactor {
  name: string;
  rewards: string;
  score: (m: ConfidenceInputs) => number;
}

/**
 * The factors of the confidence, multiplied in this order (our own ramps, tuned on rendered and
 * independently generated bars; common practice, no source).
 */
export const CONFIDENCE_FACTORS: readonly ConfidenceFactor[] = [
  { name: 'contrast', rewards: 'weaker-side contrast: 0 at 0.04, 1 from 0.16 of the gray range', score: (m) => rising(m.contrast, 0.04, 0.12) },
  { name: 'two-sided', rewards: 'contrast on both long sides (weaker/stronger: 0 at 0, 1 from 0.5); an edge has one side only', score: (m) => clamp01(m.contrast / Math.max(m.cA, m.cB) / 0.5) },
  {
    name: 'straight',
    rewards: 'straight edges: edge sd 1 up to 0.35 px, 0 from 1 px; stray edge columns 1 up to 5 %, 0 from 30 %',
    score: (m) => falling(m.edgeStd, 0.35, 0.65) * falling(m.edgeOutliers, 0.05, 0.25),
  },
  { name: 'uniform', rewards: 'uniform interior: sd/contrast 1 up to 0.1, 0 from 0.35', score: (m) => falling(m.uni, 0.1, 0.25) },
  { name: 'quiet surroundings', rewards: 'quiet strips beside the bar: √ of 1 up to sd/contrast 0.15, 0 from 0.75', score: (m) => Math.sqrt(falling(m.sur, 0.15, 0.6)) },
  { name: 'sharp ends', rewards: 'sharp ends: 20–80 % width 1 up to 4 px, 0 from 9 px; 0 without clean ends', score: (m) => (Number.isFinite(m.endW) ? falling(m.endW, 4, 5) : 0) },
  { name: 'position', rewards: 'near a side or corner: 1 within 20 % of a side, down to 0.7 at the centre', score: (m) => (m.margin < 0.2 ? 1 : 1 - (0.3 * (m.margin - 0.2)) / 0.3) },
  { name: 'label', rewards: 'a text label beside the bar: 1, none 0.9', score: (m) => (m.hasLabel ? 1 : 0.9) },
];

/** Product of the {@link CONFIDENCE_FACTORS} in their order, 0..1. */
export function barConfidence(m: ConfidenceInputs): number {
  let c = 1;
  for (const f of CONFIDENCE_FACTORS) c *= f.score(m);
  return c;
}

/**
 * Refines one candidate at full resolution: edges, thickness, ends, label, plate and confidence,
 * or null when it is not a bar (one-sided, ragged, running into the frame, too short).
 */
export function refineCandidate(ctx: Ctx, c: Candidate, polarity: 'light' | 'dark', labels: Int32Array, stats: Int32Array, n: number): ScaleBar | null {
  const b = viewOf(ctx, c, polarity);
  if (!b) return null;
  const a = fitAcross(ctx, b);
  if (!a) return null;
  const checks = checkColumns(b, a);
  const ends = findEnds(ctx, b, a, checks.inRows);
  if (!ends) return null;
  const { raster, horiz } = b;
  const { mid } = a;
  const { left, right, u0 } = ends;
  // label: text-like components of the same polarity next to the bar (work resolution)
  const label = findLabel(ctx, c, labels, stats, n);
  const cx = (horiz ? (left + right) / 2 + u0 : mid) / raster.width;
  const cy = (horiz ? mid : (left + right) / 2 + u0) / raster.height;
  const confidence = barConfidence({ ...a, ...checks, endW: ends.endW, margin: Math.min(cx, 1 - cx, cy, 1 - cy), hasLabel: !!label });
  const e0 = left + u0 + 0.5;
  const e1 = right + u0 - 0.5;
  const bar: ScaleBar = {
    x0: horiz ? e0 : mid,
    y0: horiz ? mid : e0,
    x1: horiz ? e1 : mid,
    y1: horiz ? mid : e1,
    lengthPx: ends.lengthPx,
    thicknessPx: a.thickness,
    orientation: c.orientation,
    polarity,
    confidence: Math.round(confidence * 1000) / 1000,
  };
  if (label) bar.labelBox = label;
  const plate = findPlate(raster, bar, ends.outLevel, a.inLevel, label);
  if (plate) bar.plate = plate;
  return bar;
}
