/**
 * Applying a model: class probabilities (outside, rim band, core) for every pixel of a working copy.
 * The probabilities are taken on a regular grid (every `stride`-th pixel, the last row and column
 * included) and interpolated bilinearly in between — the features are window averages of at least
 * 3 px, so they change little from one pixel to the next, and the boundaries are placed afterwards
 * along rays to sub-pixel precision (learn/segment.ts). The grid is evaluated in two passes: first
 * every other grid point along both axes; then the points between them, except where the four
 * around agree on the class with probability ≥ {@link SETTLED_PROBABILITY} — there the
 * probabilities are interpolated (far from every boundary, where nothing is decided). The features
 * are computed only at the evaluated points (learn/features.ts).
 */
import type { PointPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import { featureSampler, type FeatureSampler } from './features.js';
import { predictMany, type Forest } from './forest.js';
import { forestFromRecord, type PixelModel } from './model.js';

/** Grid points above which the grid is thinned (a stride of 2, 3 … px). */
export const MAX_GRID_POINTS = 250_000;

/**
 * Probability of the most probable class at which a point of the coarse pass counts as settled:
 * grid points between four settled points of the same class are interpolated, not evaluated (our own
 * choice, no source: well above every threshold the segmentation applies, ½; checked in the learn
 * tests and the bench).
 */
export const SETTLED_PROBABILITY = 0.95;

/** A model ready to apply: its file content, its runtime forest and its file's SHA-256. */
export interface LoadedModel {
  model: PixelModel;
  forest: Forest;
  /** SHA-256 of the model file's bytes, hex (computed by the shell; '' when not from a file). */
  sha256: string;
}

/** A model ready to apply (the forest unpacked once). */
export function loadModel(model: PixelModel, sha256 = ''): LoadedModel {
  return { model, forest: forestFromRecord(model.forest), sha256 };
}

/** Class probabilities at working resolution; at every pixel outside + rim + core = 1. */
export interface ClassProbabilities {
  width: number;
  height: number;
  outside: Float32Array;
  rim: Float32Array;
  core: Float32Array;
  /** Grid spacing the probabilities were taken at, px. */
  stride: number;
  /** Grid points the forest was evaluated at (the others interpolated: a coarse pass found them settled). */
  evaluated: number;
}

/** Grid coordinates 0, s, 2s … and the last index n − 1. */
function gridAxis(n: number, s: number): Int32Array {
  const v: number[] = [];
  for (let i = 0; i < n; i += s) v.push(i);
  if (v[v.length - 1] !== n - 1) v.push(n - 1);
  return Int32Array.from(v);
}

/** For each index 0..n−1: the grid interval k (axis[k] ≤ i ≤ axis[k+1]) and the weight of axis[k+1]. */
function axisWeights(axis: Int32Array, n: number): { k: Int32Array; t: Float32Array } {
  const k = new Int32Array(n);
  const t = new Float32Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    while (j < axis.length - 2 && axis[j + 1] < i) j++;
    const a = axis[j];
    const b = axis[Math.min(axis.length - 1, j + 1)];
    k[i] = j;
    t[i] = b > a ? (i - a) / (b - a) : 0;
  }
  return { k, t };
}

/** Bilinear upsampling of a grid of values (gw × gh) to every pixel. */
function upsample(grid: Float32Array, gw: number, gh: number, xs: { k: Int32Array; t: Float32Array }, ys: { k: Int32Array; t: Float32Array }, W: number, H: number): Float32Array {
  const out = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    const r0 = ys.k[y] * gw;
    const r1 = Math.min(gh - 1, ys.k[y] + 1) * gw;
    const ty = ys.t[y];
    upsampleRow(grid, r0, r1, ty, xs, gw, out, y * W, W);
  }
  return out;
}

function upsampleRow(grid: Float32Array, r0: number, r1: number, ty: number, xs: { k: Int32Array; t: Float32Array }, gw: number, out: Float32Array, o: number, W: number): void {
  for (let x = 0; x < W; x++) {
    const c0 = xs.k[x];
    const c1 = Math.min(gw - 1, c0 + 1);
    const tx = xs.t[x];
    const top = grid[r0 + c0] * (1 - tx) + grid[r0 + c1] * tx;
    const bot = grid[r1 + c0] * (1 - tx) + grid[r1 + c1] * tx;
    out[o + x] = top * (1 - ty) + bot * ty;
  }
}

/** Grid spacing (px) for at most `maxGridPoints` forest evaluations on a W × H working copy. */
export function gridStride(W: number, H: number, maxGridPoints: number): number {
  return Math.max(1, Math.ceil(Math.sqrt((W * H) / maxGridPoints)));
}

/**
 * The feature vectors of every point of the grid {@link predictProbabilities} evaluates on (stride
 * {@link gridStride}, the last row and column included), computed once: a caller that shows class
 * maps of several models on one image (the app's teach mode) passes it back as `grid` and only the
 * forest runs.
 */
export interface GridFeatures {
  width: number;
  height: number;
  stride: number;
  nFeatures: number;
  /** Features of grid point j·gw + i (row-major over the grid), nFeatures each. */
  X: Float32Array;
}

/** Features of every grid point of a W × H working copy (see {@link GridFeatures}). */
export function gridFeatures(W: number, H: number, sampler: FeatureSampler, maxGridPoints = MAX_GRID_POINTS): GridFeatures {
  const stride = gridStride(W, H, maxGridPoints);
  const gx = gridAxis(W, stride);
  const gy = gridAxis(H, stride);
  const at = new Int32Array(gx.length * gy.length);
  for (let j = 0, k = 0; j < gy.length; j++) for (let i = 0; i < gx.length; i++, k++) at[k] = gy[j] * W + gx[i];
  return { width: W, height: H, stride, nFeatures: sampler.nFeatures, X: sampler.at(at) };
}

/** Features at grid points (indices into the gw-wide grid, ascending). */
type GridSource = (g: Int32Array) => Float32Array;

/**
 * Class probabilities of every working-copy pixel.
 *
 * @param work - the working copy (scale marks painted out, as for measuring)
 * @param umPerWorkPx - its pixel size, µm per px
 * @param loaded - the model
 * @param center - the specimen centre for the radiality feature, working px (learn/features.ts `featureCentre`)
 * @param maxGridPoints - forest evaluations above which the grid is thinned (default {@link MAX_GRID_POINTS})
 * @param grid - the grid's features computed before ({@link gridFeatures} with the same working copy,
 *   model windows, centre and `maxGridPoints`); without it they are computed here at the points evaluated
 */
export function predictProbabilities(work: GrayRaster, umPerWorkPx: number, loaded: LoadedModel, center: PointPx, maxGridPoints = MAX_GRID_POINTS, grid?: GridFeatures): ClassProbabilities {
  const { width: W, height: H } = work;
  const stride = gridStride(W, H, maxGridPoints);
  const gx = gridAxis(W, stride);
  const gy = gridAxis(H, stride);
  const gw = gx.length;
  const gh = gy.length;
  const C = loaded.forest.nClasses;
  const planes = Array.from({ length: C }, () => new Float32Array(gw * gh));
  let source: GridSource;
  if (grid) {
    if (grid.width !== W || grid.height !== H || grid.stride !== stride || grid.nFeatures !== loaded.forest.nFeatures) throw new Error('predictProbabilities: the grid features were made for another image, grid or feature set');
    const F = grid.nFeatures;
    source = (g) => {
      const out = new Float32Array(g.length * F);
      for (let n = 0; n < g.length; n++) out.set(grid.X.subarray(g[n] * F, (g[n] + 1) * F), n * F);
      return out;
    };
  } else {
    const sampler = featureSampler(work, umPerWorkPx, loaded.model.windowsUm, center);
    source = (g) => sampler.at(Int32Array.from(g, (k) => gy[Math.floor(k / gw)] * W + gx[k % gw]));
  }
  // pass 1: every other grid point along both axes (and the last ones)
  const cx = gridAxis(gw, 2);
  const cy = gridAxis(gh, 2);
  const coarse = new Int32Array(cx.length * cy.length);
  for (let j = 0; j < cy.length; j++) for (let i = 0; i < cx.length; i++) coarse[j * cx.length + i] = cy[j] * gw + cx[i];
  let evaluated = evaluate(loaded.forest, source, coarse, planes);
  // pass 2: the grid points between them, where the four around disagree or are unsure
  const top = new Int8Array(gw * gh).fill(-1); // settled class of an evaluated point, −1 unsure
  for (const g of coarse) {
    let best = 0;
    for (let c = 1; c < C; c++) if (planes[c][g] > planes[best][g]) best = c;
    if (planes[best][g] >= SETTLED_PROBABILITY) top[g] = best;
  }
  const xs = axisWeights(cx, gw);
  const ys = axisWeights(cy, gh);
  const rest: number[] = [];
  for (let j = 0; j < gh; j++) {
    const j0 = cy[ys.k[j]];
    const j1 = cy[Math.min(cy.length - 1, ys.k[j] + 1)];
    const ty = ys.t[j];
    for (let i = 0; i < gw; i++) {
      const i0 = cx[xs.k[i]];
      const i1 = cx[Math.min(cx.length - 1, xs.k[i] + 1)];
      const tx = xs.t[i];
      const g = j * gw + i;
      if ((i === i0 || i === i1) && (j === j0 || j === j1)) continue; // evaluated in pass 1
      const a = j0 * gw + i0;
      const b = j0 * gw + i1;
      const c = j1 * gw + i0;
      const d = j1 * gw + i1;
      const t = top[a];
      if (t < 0 || top[b] !== t || top[c] !== t || top[d] !== t) {
        rest.push(g);
        continue;
      }
      for (const p of planes) p[g] = (p[a] * (1 - tx) + p[b] * tx) * (1 - ty) + (p[c] * (1 - tx) + p[d] * tx) * ty;
    }
  }
  evaluated += evaluate(loaded.forest, source, Int32Array.from(rest), planes);
  const px = axisWeights(gx, W);
  const py = axisWeights(gy, H);
  const [outside, rim, core] = planes.map((g) => (stride === 1 ? g : upsample(g, gw, gh, px, py, W, H)));
  return { width: W, height: H, outside, rim, core, stride, evaluated };
}

/** Features and forest at grid points `g` (indices into the grid, ascending), written into `planes`; returns their number. */
function evaluate(forest: Forest, source: GridSource, g: Int32Array, planes: Float32Array[]): number {
  if (!g.length) return 0;
  const out = planes.map(() => new Float32Array(g.length));
  predictMany(forest, source(g), out);
  for (let c = 0; c < planes.length; c++) {
    const p = planes[c];
    const o = out[c];
    for (let n = 0; n < g.length; n++) p[g[n]] = o[n];
  }
  return g.length;
}

/** The most probable class of every pixel: 1 outside, 2 rim band, 3 core (the label values). */
export function classMap(p: ClassProbabilities): Uint8Array {
  const out = new Uint8Array(p.width * p.height);
  for (let i = 0; i < out.length; i++) {
    const o = p.outside[i];
    const r = p.rim[i];
    const c = p.core[i];
    out[i] = o >= r && o >= c ? 1 : r >= c ? 2 : 3;
  }
  return out;
}
