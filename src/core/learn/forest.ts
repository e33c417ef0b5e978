/**
 * A random forest classifier (Breiman, Machine Learning 45, 2001) for per-pixel class probabilities:
 * CART trees grown on class-balanced bootstrap samples with the Gini impurity, a random subset of √F features tried
 * at every split, leaves holding class distributions; the forest's probability is the mean of its
 * trees' leaf distributions (soft voting); out-of-bag accuracy from the trees that did not see a sample.
 *
 * Hand-written, not `ml-random-forest` (measured 2026-12-03 on this machine, DEVELOPERS.md "Pixel
 * classifier"): its split search evaluates every candidate threshold by re-splitting every sample
 * (quadratic in the node size: 8.4 s for 500 samples × 20 features × 20 trees, 27.6 s for 1000, where
 * this one takes ≈ 0.1 s for 6000), it draws the feature subset once per tree instead of per split,
 * its out-of-bag collection throws when a sample is never out of bag, and its prediction walks
 * object trees row by row through matrix views. Here:
 *
 * - splits are searched on features quantised into at most {@link MAX_BINS} bins per feature (bin
 *   edges = quantiles of the training values, as in histogram-based tree learners): one pass per
 *   feature and node, O(node size); a split sends x < edge to the left, on the raw value, so
 *   prediction needs no binning and gives exactly the training-time decisions;
 * - every random draw (bootstrap, feature subsets) comes from one seeded mulberry32 stream
 *   (core/random.ts): the same samples and seed give the same trees, bit for bit;
 * - each tree's bootstrap draws from every class as many samples as the smallest class has (a
 *   balanced random forest), so a class with few labelled pixels weighs as much as a common one;
 * - the trees are stored flat (typed arrays of feature, threshold, children, leaf distribution)
 *   and prediction walks all trees for one sample at a time.
 */
import { FractozoneError } from '../errors.js';
import { createRng, type Rng } from '../random.js';

/** Largest number of bins a feature is quantised into for the split search. */
export const MAX_BINS = 64;

/** Options of {@link trainForest}. */
export interface ForestOptions {
  /** Number of trees. */
  nTrees: number;
  /** Largest depth of a tree (root = 0). */
  maxDepth: number;
  /** A node with fewer (bootstrap) samples than this becomes a leaf. */
  minSplit: number;
  /** Features tried per split (default ⌈√F⌉). */
  mtry?: number;
  /** Seed of the random stream. */
  seed: number;
}

/** The trained forest, flat: node k of the forest is a split (feature[k] ≥ 0) or a leaf (feature[k] = −1). */
export interface Forest {
  nFeatures: number;
  nClasses: number;
  /** Index of each tree's root node. */
  roots: Int32Array;
  feature: Int16Array;
  threshold: Float32Array;
  left: Int32Array;
  right: Int32Array;
  /** Leaf class distributions, nClasses per node (zeros for split nodes). */
  value: Float32Array;
}

/** Training summary of {@link trainForest}. */
export interface ForestTraining {
  forest: Forest;
  /** Fraction of the samples that the trees which did not see them classify correctly. */
  oobAccuracy: number;
  /** The same per class (NaN for a class without out-of-bag votes). */
  oobAccuracyByClass: number[];
  /** Samples with at least one out-of-bag vote. */
  oobSamples: number;
}

/** Bin edges per feature: up to MAX_BINS − 1 distinct quantiles of the training values. */
function binEdges(X: Float32Array, n: number, F: number, f: number): Float32Array {
  const v = new Float32Array(n);
  for (let i = 0; i < n; i++) v[i] = X[i * F + f];
  v.sort();
  const edges: number[] = [];
  for (let b = 1; b < MAX_BINS; b++) {
    const e = v[Math.min(n - 1, Math.floor((b * n) / MAX_BINS))];
    // an edge is a value some samples lie below: the smallest value is never one
    if (e > v[0] && (edges.length === 0 || e > edges[edges.length - 1])) edges.push(e);
  }
  return Float32Array.from(edges);
}

/** Number of edges ≤ x (x < edges[b] ⇔ bin ≤ b). */
function binOf(edges: Float32Array, x: number): number {
  let lo = 0;
  let hi = edges.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (edges[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Growing flat arrays of the nodes of all trees. */
class NodeStore {
  feature: number[] = [];
  threshold: number[] = [];
  left: number[] = [];
  right: number[] = [];
  value: number[] = [];
  constructor(readonly nClasses: number) {}
  add(): number {
    const k = this.feature.length;
    this.feature.push(-1);
    this.threshold.push(0);
    this.left.push(-1);
    this.right.push(-1);
    for (let c = 0; c < this.nClasses; c++) this.value.push(0);
    return k;
  }
}

interface TreeData {
  bins: Uint8Array;
  edges: Float32Array[];
  y: Uint8Array;
  w: Float64Array;
  F: number;
  C: number;
}

/** Best split of samples idx[a..b) over the features `feats`: [feature, bin, gain] or null. */
function bestSplit(d: TreeData, idx: Int32Array, a: number, b: number, feats: Int32Array, hist: Float64Array, total: Float64Array): [number, number] | null {
  const { C, F, bins, y, w } = d;
  let totW = 0;
  let sumSq = 0;
  for (let c = 0; c < C; c++) {
    totW += total[c];
    sumSq += total[c] * total[c];
  }
  const parent = totW - sumSq / totW; // weighted Gini impurity × total weight
  let bestGain = 1e-12 * totW;
  let bestF = -1;
  let bestB = -1;
  const leftW = new Float64Array(C);
  for (let q = 0; q < feats.length; q++) {
    const f = feats[q];
    const nb = d.edges[f].length + 1;
    if (nb < 2) continue;
    hist.fill(0, 0, nb * C);
    for (let k = a; k < b; k++) {
      const i = idx[k];
      hist[bins[i * F + f] * C + y[i]] += w[i];
    }
    leftW.fill(0);
    let lw = 0;
    for (let bin = 0; bin < nb - 1; bin++) {
      let any = 0;
      for (let c = 0; c < C; c++) {
        const h = hist[bin * C + c];
        leftW[c] += h;
        lw += h;
        any += h;
      }
      if (any === 0 && bin > 0) continue;
      const rw = totW - lw;
      if (lw <= 0 || rw <= 0) continue;
      let sl = 0;
      let sr = 0;
      for (let c = 0; c < C; c++) {
        sl += leftW[c] * leftW[c];
        const r = total[c] - leftW[c];
        sr += r * r;
      }
      const gain = parent - (lw - sl / lw) - (rw - sr / rw);
      if (gain > bestGain) {
        bestGain = gain;
        bestF = f;
        bestB = bin;
      }
    }
  }
  return bestF < 0 ? null : [bestF, bestB];
}

/** Moves the samples of idx[a..b) with bin ≤ splitBin of feature f to the front; returns the split point. */
function partition(d: TreeData, idx: Int32Array, a: number, b: number, f: number, splitBin: number): number {
  let i = a;
  let j = b - 1;
  while (i <= j) {
    if (d.bins[idx[i] * d.F + f] <= splitBin) i++;
    else {
      const t = idx[i];
      idx[i] = idx[j];
      idx[j] = t;
      j--;
    }
  }
  return i;
}

/** Weighted class totals of idx[a..b). */
function classTotals(d: TreeData, idx: Int32Array, a: number, b: number, out: Float64Array): void {
  out.fill(0);
  for (let k = a; k < b; k++) out[d.y[idx[k]]] += d.w[idx[k]];
}

/** Grows one tree on the bootstrap sample `idx` (depth first, an explicit stack). */
function growTree(d: TreeData, idx: Int32Array, store: NodeStore, opts: Required<ForestOptions>, rng: Rng): number {
  const { C, F } = d;
  const hist = new Float64Array(MAX_BINS * C);
  const total = new Float64Array(C);
  const order = Int32Array.from({ length: F }, (_, i) => i);
  const feats = new Int32Array(opts.mtry);
  const root = store.add();
  const stack: [number, number, number, number][] = [[root, 0, idx.length, 0]];
  while (stack.length) {
    const [node, a, b, depth] = stack.pop() as [number, number, number, number];
    classTotals(d, idx, a, b, total);
    let nonEmpty = 0;
    for (let c = 0; c < C; c++) if (total[c] > 0) nonEmpty++;
    let split: [number, number] | null = null;
    if (depth < opts.maxDepth && b - a >= opts.minSplit && nonEmpty > 1) {
      // partial Fisher–Yates: the first mtry entries of `order` become a random feature subset
      for (let q = 0; q < opts.mtry; q++) {
        const r = q + rng.int(F - q);
        const t = order[q];
        order[q] = order[r];
        order[r] = t;
        feats[q] = order[q];
      }
      split = bestSplit(d, idx, a, b, feats, hist, total);
    }
    if (!split) {
      let s = 0;
      for (let c = 0; c < C; c++) s += total[c];
      for (let c = 0; c < C; c++) store.value[node * C + c] = s > 0 ? total[c] / s : 1 / C;
      continue;
    }
    const [f, bin] = split;
    const m = partition(d, idx, a, b, f, bin);
    const l = store.add();
    const r = store.add();
    store.feature[node] = f;
    store.threshold[node] = d.edges[f][bin];
    store.left[node] = l;
    store.right[node] = r;
    stack.push([r, m, b, depth + 1], [l, a, m, depth + 1]);
  }
  return root;
}

function checkTrainingSet(X: Float32Array, y: Uint8Array, nFeatures: number, nClasses: number): number {
  const n = y.length;
  if (!(nFeatures >= 1) || X.length !== n * nFeatures) throw new FractozoneError('BAD_PARAMETER', 'the training features do not match the number of samples');
  if (n < 2) throw new FractozoneError('BAD_PARAMETER', 'at least two training samples are needed');
  for (let i = 0; i < X.length; i++) if (!Number.isFinite(X[i])) throw new FractozoneError('BAD_PARAMETER', `training feature ${i % nFeatures} of sample ${Math.floor(i / nFeatures)} is not a finite number`);
  for (let i = 0; i < n; i++) if (y[i] >= nClasses) throw new FractozoneError('BAD_PARAMETER', `training class ${y[i]} of sample ${i} is not below ${nClasses}`);
  return n;
}

/**
 * Trains a forest.
 *
 * @param X - features, row-major, `nFeatures` per sample (finite)
 * @param y - class of each sample, 0..nClasses−1
 * @param nFeatures - features per sample
 * @param nClasses - number of classes
 * @param opts - trees, depth, leaf size, features per split, seed
 * @returns the forest and its out-of-bag accuracy
 */
export function trainForest(X: Float32Array, y: Uint8Array, nFeatures: number, nClasses: number, opts: ForestOptions): ForestTraining {
  const n = checkTrainingSet(X, y, nFeatures, nClasses);
  const F = nFeatures;
  const C = nClasses;
  const edges = Array.from({ length: F }, (_, f) => binEdges(X, n, F, f));
  const bins = new Uint8Array(n * F);
  for (let i = 0; i < n; i++) for (let f = 0; f < F; f++) bins[i * F + f] = binOf(edges[f], X[i * F + f]);
  // balanced bootstrap (Chen, Liaw & Breiman 2004, "balanced random forest"): every tree draws as
  // many samples of each class, with replacement, as the smallest class has, so a rare class weighs
  // as much as a common one and every class keeps out-of-bag samples
  const members: Int32Array[] = Array.from({ length: C }, (_, c) => Int32Array.from(Array.from(y.keys()).filter((i) => y[i] === c)));
  const present = members.filter((m) => m.length > 0);
  const perClass = Math.min(...present.map((m) => m.length));
  const w = new Float64Array(n).fill(1);
  const full: Required<ForestOptions> = { ...opts, mtry: Math.max(1, Math.min(F, opts.mtry ?? Math.ceil(Math.sqrt(F)))) };
  const d: TreeData = { bins, edges, y, w, F, C };
  const store = new NodeStore(C);
  const rng = createRng(opts.seed);
  const roots = new Int32Array(opts.nTrees);
  const oobVotes = new Float64Array(n * C);
  const inBag = new Uint8Array(n);
  const idx = new Int32Array(perClass * present.length);
  const x = new Float32Array(F);
  for (let t = 0; t < opts.nTrees; t++) {
    inBag.fill(0);
    let k = 0;
    for (const m of present) {
      for (let j = 0; j < perClass; j++) {
        const i = m[rng.int(m.length)];
        idx[k++] = i;
        inBag[i] = 1;
      }
    }
    roots[t] = growTree(d, idx, store, full, rng);
    for (let i = 0; i < n; i++) {
      if (inBag[i]) continue;
      for (let f = 0; f < F; f++) x[f] = X[i * F + f];
      const leaf = walk(store.feature, store.threshold, store.left, store.right, roots[t], x);
      for (let c = 0; c < C; c++) oobVotes[i * C + c] += store.value[leaf * C + c];
    }
  }
  const forest: Forest = {
    nFeatures: F,
    nClasses: C,
    roots,
    feature: Int16Array.from(store.feature),
    threshold: Float32Array.from(store.threshold),
    left: Int32Array.from(store.left),
    right: Int32Array.from(store.right),
    value: Float32Array.from(store.value),
  };
  return { forest, ...oobSummary(oobVotes, y, C) };
}

/** Out-of-bag accuracy overall and per class from the accumulated votes. */
function oobSummary(votes: Float64Array, y: Uint8Array, C: number): Omit<ForestTraining, 'forest'> {
  const right = new Float64Array(C);
  const seen = new Float64Array(C);
  let nOk = 0;
  let nSeen = 0;
  for (let i = 0; i < y.length; i++) {
    let best = -1;
    let bestV = 0;
    for (let c = 0; c < C; c++) if (votes[i * C + c] > bestV) [best, bestV] = [c, votes[i * C + c]];
    if (best < 0) continue;
    nSeen++;
    seen[y[i]]++;
    if (best === y[i]) {
      nOk++;
      right[y[i]]++;
    }
  }
  return {
    oobAccuracy: nSeen ? nOk / nSeen : NaN,
    oobAccuracyByClass: Array.from(right, (r, c) => (seen[c] ? r / seen[c] : NaN)),
    oobSamples: nSeen,
  };
}

/** Leaf reached by sample x from node k. */
function walk(feature: ArrayLike<number>, threshold: ArrayLike<number>, left: ArrayLike<number>, right: ArrayLike<number>, k: number, x: ArrayLike<number>): number {
  while (feature[k] >= 0) k = x[feature[k]] < threshold[k] ? left[k] : right[k];
  return k;
}

/** The tree structure packed for prediction: [feature, left, right, 0] per node (feature −1 for a leaf). */
function packNodes(forest: Forest): Int32Array {
  const n = forest.feature.length;
  const packed = new Int32Array(4 * n);
  for (let k = 0; k < n; k++) {
    packed[4 * k] = forest.feature[k];
    packed[4 * k + 1] = forest.left[k];
    packed[4 * k + 2] = forest.right[k];
  }
  return packed;
}

/** Leaf of one tree for the sample whose features start at `base` of the row-major matrix X. */
function leafOf(nodes: Int32Array, thr: Float32Array, root: number, X: Float32Array, base: number): number {
  let k = root;
  let f = nodes[4 * k];
  while (f >= 0) {
    k = X[base + f] < thr[k] ? nodes[4 * k + 1] : nodes[4 * k + 2];
    f = nodes[4 * k];
  }
  return k;
}

/**
 * Class probabilities of many samples (row-major features, nFeatures per sample): the mean of the
 * trees' leaf distributions. Tree by tree over all samples, so each tree's nodes stay in the
 * processor's cache.
 *
 * @param forest - trained forest
 * @param X - features, row-major, nFeatures per sample
 * @param out - one array per class, one entry per sample, receives the probabilities
 */
export function predictMany(forest: Forest, X: Float32Array, out: Float32Array[]): void {
  const C = forest.nClasses;
  const F = forest.nFeatures;
  const n = X.length / F;
  if (!Number.isInteger(n) || out.length !== C || out.some((o) => o.length !== n)) throw new FractozoneError('BAD_PARAMETER', 'the samples or outputs do not match the forest');
  const nodes = packNodes(forest);
  const { value, roots, threshold } = forest;
  for (const o of out) o.fill(0);
  const inv = 1 / roots.length;
  for (let t = 0; t < roots.length; t++) {
    const root = roots[t];
    for (let i = 0; i < n; i++) {
      const leaf = leafOf(nodes, threshold, root, X, i * F);
      for (let c = 0; c < C; c++) out[c][i] += value[leaf * C + c] * inv;
    }
  }
}

/**
 * Class probabilities of one sample: the mean of the trees' leaf distributions.
 *
 * @param forest - trained forest
 * @param x - the sample's features (nFeatures)
 * @param out - receives nClasses probabilities
 */
export function predictOne(forest: Forest, x: ArrayLike<number>, out: Float64Array): void {
  const C = forest.nClasses;
  out.fill(0);
  const { feature, threshold, left, right, value, roots } = forest;
  for (let t = 0; t < roots.length; t++) {
    const leaf = walk(feature, threshold, left, right, roots[t], x);
    for (let c = 0; c < C; c++) out[c] += value[leaf * C + c];
  }
  for (let c = 0; c < C; c++) out[c] /= roots.length;
}
