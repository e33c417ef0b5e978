/**
 * Applying a model: class probabilities (outside, rim band, core) for every pixel of a working copy.
 * The features are computed and the forest evaluated on a regular grid (every `stride`-th pixel,
 * the last row and column included; learn/features.ts evaluates the features at those pixels only)
 * and the probabilities are interpolated bilinearly in between — the features are window averages
 * of at least 3 px, so they change little from one pixel to the next, and the boundaries are placed
 * afterwards along rays to sub-pixel precision (learn/segment.ts).
 */
import type { PointPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import { pixelFeaturesAt } from './features.js';
import { predictMany, type Forest } from './forest.js';
import { forestFromRecord, type PixelModel } from './model.js';

/** Forest evaluations above which the grid is thinned (a stride of 2, 3 … px). */
export const MAX_GRID_POINTS = 250_000;

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
  /** Grid spacing the forest was evaluated at, px. */
  stride: number;
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

/**
 * Class probabilities of every working-copy pixel.
 *
 * @param work - the working copy (scale marks painted out, as for measuring)
 * @param umPerWorkPx - its pixel size, µm per px
 * @param loaded - the model
 * @param center - the specimen centre for the radiality feature, working px (learn/features.ts `featureCentre`)
 * @param maxGridPoints - forest evaluations above which the grid is thinned (default {@link MAX_GRID_POINTS})
 */
export function predictProbabilities(work: GrayRaster, umPerWorkPx: number, loaded: LoadedModel, center: PointPx, maxGridPoints = MAX_GRID_POINTS): ClassProbabilities {
  const { width: W, height: H } = work;
  const stride = Math.max(1, Math.ceil(Math.sqrt((W * H) / maxGridPoints)));
  const gx = gridAxis(W, stride);
  const gy = gridAxis(H, stride);
  const gw = gx.length;
  const gh = gy.length;
  const C = loaded.forest.nClasses;
  const planes = Array.from({ length: C }, () => new Float32Array(gw * gh));
  const at = new Int32Array(gw * gh);
  for (let j = 0; j < gh; j++) for (let i = 0; i < gw; i++) at[j * gw + i] = gy[j] * W + gx[i];
  const X = pixelFeaturesAt(work, umPerWorkPx, loaded.model.windowsUm, center, at);
  predictMany(loaded.forest, X, planes);
  const xs = axisWeights(gx, W);
  const ys = axisWeights(gy, H);
  const [outside, rim, core] = planes.map((g) => (stride === 1 ? g : upsample(g, gw, gh, xs, ys, W, H)));
  return { width: W, height: H, outside, rim, core, stride };
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
