/**
 * Teaching: a pixel classifier from one or more images with label rasters. Each image goes through
 * the measurement's own first stages (scale and scale-mark detection, the working copy with the
 * marks painted out), so the features the model learns from are those `measure` computes later.
 * Labelled full-resolution pixels are carried to the working copy (a working pixel takes a label
 * when every labelled pixel it covers has the same one); a seeded subsample of at most
 * `samplesPerClass` pixels per class is chosen first, the features are computed at those pixels
 * only (learn/features.ts `pixelFeaturesAt`), and they train the forest (balanced bootstrap,
 * learn/forest.ts).
 */
import type { DecodedImage } from '../decode/types.js';
import { FractozoneError } from '../errors.js';
import type { WorkingFrame } from '../pipeline/frame.js';
import type { ScaleParams } from '../pipeline/types.js';
import { createRng } from '../random.js';
import { PIXEL_FEATURE_SET, pixelFeatureNames } from './features.js';
import { prepareImage, type PreparedImage } from './prepared.js';
import { trainForest } from './forest.js';
import { CLASS_NAMES, checkLabels, countLabels, forEachLabelled, type ClassCounts, type LabelRaster } from './labels.js';
import { forestRecord, sealModel, type ModelTrainingImage, type PixelModel } from './model.js';

/** One training image with its labels. */
export interface TeachImage {
  decoded: DecodedImage;
  labels: LabelRaster;
  /** How the scale is set (as for `measure`). */
  scale: ScaleParams;
  /** File name as given, SHA-256 of the image file and of the label file (hex; computed by the shell). */
  file: string;
  sha256: string;
  labelsSha256: string;
  /**
   * The image made ready before (learn/prepared.ts, with this `decoded` and `scale`): its working
   * copy, centre and feature tables are used instead of being made again.
   */
  prepared?: PreparedImage;
}

/** Options of {@link teachModel}; every field has a default ({@link TEACH_DEFAULTS}). */
export interface TeachOptions {
  /** Feature windows in µm; default ½, 1 and 2 × the default texture window of the first image. */
  windowsUm?: number[] | null;
  seed?: number;
  nTrees?: number;
  maxDepth?: number;
  minSplit?: number;
  /** Upper limit of the pixels sampled per class. */
  samplesPerClass?: number;
}

/** Default forest settings: our own choice (common practice for pixel classifiers, no source), measured in the bench. */
export const TEACH_DEFAULTS = { seed: 1, nTrees: 32, maxDepth: 14, minSplit: 4, samplesPerClass: 2500 } as const;

/** What teaching gives: the model and how long each part took (diagnostics). */
export interface Teaching {
  model: PixelModel;
  timingsMs: Record<string, number>;
}

/** Labelled working-copy pixels: their indices and classes (0 outside, 1 rim, 2 core). */
interface WorkingLabels {
  index: Int32Array;
  cls: Uint8Array;
}

/** Labels carried to the working copy: a working pixel whose labelled pixels all agree takes their class. */
function workingLabels(labels: LabelRaster, frame: WorkingFrame): WorkingLabels {
  const w = frame.work.width;
  const h = frame.work.height;
  const seen = new Uint8Array(w * h); // bit L set when label L was seen
  const colOf = Int32Array.from({ length: labels.width }, (_, x) => Math.min(w - 1, Math.floor(x / frame.sx)));
  const rowOf = Int32Array.from({ length: labels.height }, (_, y) => Math.min(h - 1, Math.floor(y / frame.sy)) * w);
  forEachLabelled(labels.data, (i, v) => {
    const y = Math.floor(i / labels.width);
    seen[rowOf[y] + colOf[i - y * labels.width]] |= 1 << v;
  });
  const idx: number[] = [];
  const cls: number[] = [];
  for (let i = 0; i < seen.length; i++) {
    const s = seen[i];
    if (s === 2 || s === 4 || s === 8) {
      idx.push(i);
      cls.push(s === 2 ? 0 : s === 4 ? 1 : 2);
    }
  }
  return { index: Int32Array.from(idx), cls: Uint8Array.from(cls) };
}

/** A class without any labelled pixel stops the teaching. */
function checkClasses(counts: ClassCounts, where: string): void {
  for (const [k, c] of CLASS_NAMES.entries()) {
    if (counts[c] === 0) throw new FractozoneError('BAD_LABELS', `no pixel is labelled ${c} (value ${k + 1}) ${where}; every class needs some labelled pixels`);
  }
}

/** Per-image part of teaching: the prepared image, the labelled working pixels and the record. */
interface ImageContext {
  prepared: PreparedImage;
  labels: WorkingLabels;
  record: ModelTrainingImage;
}

function imageContext(img: TeachImage, counts: ClassCounts): ImageContext {
  const prepared = img.prepared ?? prepareImage(img.decoded, img.scale);
  return {
    prepared,
    labels: workingLabels(img.labels, prepared.frame),
    record: { file: img.file, sha256: img.sha256, labelsSha256: img.labelsSha256, umPerPx: prepared.umPerPx, labelledPixels: counts },
  };
}

/**
 * Trains a pixel classifier.
 *
 * @param images - one or more images with their labels and scale settings
 * @param options - windows, seed and forest settings (defaults {@link TEACH_DEFAULTS})
 * @returns the sealed model (schema fractozone.model/1) and timings
 * @throws FractozoneError BAD_LABELS for labels of another size, values above 3, or a class with no
 *   labelled pixel; BAD_SCALE when an image's scale cannot be set; BAD_PARAMETER for bad settings
 */
export function teachModel(images: readonly TeachImage[], options: TeachOptions = {}): Teaching {
  const o = { ...TEACH_DEFAULTS, ...Object.fromEntries(Object.entries(options).filter(([, v]) => v !== undefined && v !== null)) };
  if (!images.length) throw new FractozoneError('BAD_PARAMETER', 'teaching needs at least one image with its labels');
  for (const k of ['nTrees', 'maxDepth', 'minSplit', 'samplesPerClass'] as const) {
    if (!Number.isInteger(o[k]) || o[k] < 1 || o[k] > 1_000_000) throw new FractozoneError('BAD_PARAMETER', `${k} must be a whole number 1..1000000, got ${o[k]}`);
  }
  if (!Number.isInteger(o.seed)) throw new FractozoneError('BAD_PARAMETER', `the seed must be a whole number, got ${o.seed}`);
  const t0 = performance.now();
  let windowsUm = options.windowsUm ?? null;
  if (windowsUm && (!windowsUm.length || windowsUm.some((w) => !(Number.isFinite(w) && w > 0)))) throw new FractozoneError('BAD_PARAMETER', 'feature windows must be positive lengths in µm');
  const labelName = (i: number): string => (images.length > 1 ? `the label image of image ${i + 1} (${images[i].file})` : 'the label image');
  const total = [0, 0, 0];
  const counts = images.map((img, i) => {
    checkLabels(img.labels, { width: img.decoded.widthPx, height: img.decoded.heightPx }, labelName(i));
    const c = countLabels(img.labels);
    CLASS_NAMES.forEach((name, k) => (total[k] += c[name]));
    return c;
  });
  checkClasses(toCounts(total), images.length > 1 ? 'in any label image' : 'in the label image');
  // the windows come from the first image unless given
  const contexts = images.map((img, i) => {
    const ctx = imageContext(img, counts[i]);
    windowsUm ??= ctx.prepared.defaultWindowsUm;
    return ctx;
  });
  const windows = windowsUm as number[];
  const chosen = chooseSamples(contexts, o);
  const tSelect = performance.now();
  // features of the chosen pixels only, image by image, in the order of the chosen samples
  const F = pixelFeatureNames(windows).length;
  const X = new Float32Array(chosen.image.length * F);
  for (const [k, ctx] of contexts.entries()) {
    const rows: number[] = [];
    for (let j = 0; j < chosen.image.length; j++) if (chosen.image[j] === k) rows.push(j);
    if (!rows.length) continue;
    const order = rows.slice().sort((a, b) => chosen.pixel[a] - chosen.pixel[b]);
    const f = ctx.prepared.sampler(windows).at(Int32Array.from(order, (j) => chosen.pixel[j]));
    order.forEach((j, r) => X.set(f.subarray(r * F, (r + 1) * F), j * F));
  }
  const tFeatures = performance.now();
  const model = fit(X, chosen, windows, contexts.map((c) => c.record), o);
  return { model, timingsMs: { images: Math.round(tSelect - t0), features: Math.round(tFeatures - tSelect), forest: Math.round(performance.now() - tFeatures) } };
}

/** The training samples: for each, its image, working pixel and class; and the per-class counts. */
interface ChosenSamples {
  image: Int32Array;
  pixel: Int32Array;
  cls: Uint8Array;
  labelledWorkingPixels: ClassCounts;
  pixelsPerClass: ClassCounts;
}

/**
 * Seeded balanced subsample: at most `samplesPerClass` of the labelled working pixels of each class
 * (all images together, in image order), each class's choice sorted back into that order.
 */
function chooseSamples(contexts: ImageContext[], o: typeof TEACH_DEFAULTS): ChosenSamples {
  const C = CLASS_NAMES.length;
  const image: number[] = [];
  const pixel: number[] = [];
  const cls: number[] = [];
  contexts.forEach((ctx, k) => {
    ctx.labels.index.forEach((p, j) => {
      image.push(k);
      pixel.push(p);
      cls.push(ctx.labels.cls[j]);
    });
  });
  const byClass: number[][] = Array.from({ length: C }, () => []);
  cls.forEach((c, i) => byClass[c].push(i));
  const labelledWorkingPixels = toCounts(byClass.map((l) => l.length));
  checkClasses(labelledWorkingPixels, 'at the working resolution (the labelled strokes are thinner than one working pixel or mix classes)');
  const rng = createRng(o.seed).fork('samples');
  const chosen = byClass.map((list) => {
    const a = list.slice();
    const k = Math.min(a.length, o.samplesPerClass);
    for (let i = 0; i < k; i++) {
      const j = i + rng.int(a.length - i);
      [a[i], a[j]] = [a[j], a[i]];
    }
    return a.slice(0, k).sort((p, q) => p - q);
  });
  const all = chosen.flat();
  return {
    image: Int32Array.from(all, (r) => image[r]),
    pixel: Int32Array.from(all, (r) => pixel[r]),
    cls: Uint8Array.from(all, (r) => cls[r]),
    labelledWorkingPixels,
    pixelsPerClass: toCounts(chosen.map((l) => l.length)),
  };
}

/** The forest on the chosen samples, the sealed model. */
function fit(X: Float32Array, s: ChosenSamples, windowsUm: number[], images: ModelTrainingImage[], o: typeof TEACH_DEFAULTS): PixelModel {
  const C = CLASS_NAMES.length;
  const F = pixelFeatureNames(windowsUm).length;
  const mtry = Math.ceil(Math.sqrt(F));
  const t = trainForest(X, s.cls, F, C, { nTrees: o.nTrees, maxDepth: o.maxDepth, minSplit: o.minSplit, mtry, seed: o.seed });
  const r6 = (v: number): number | null => (Number.isFinite(v) ? Math.round(v * 1e6) / 1e6 : null);
  return sealModel({
    featureSet: PIXEL_FEATURE_SET,
    features: pixelFeatureNames(windowsUm),
    windowsUm,
    classes: [...CLASS_NAMES],
    training: {
      images,
      labelledWorkingPixels: s.labelledWorkingPixels,
      pixelsPerClass: s.pixelsPerClass,
      oobAccuracy: r6(t.oobAccuracy) ?? 0,
      oobAccuracyByClass: { outside: r6(t.oobAccuracyByClass[0]), rim: r6(t.oobAccuracyByClass[1]), core: r6(t.oobAccuracyByClass[2]) },
      seed: o.seed,
      nTrees: o.nTrees,
      maxDepth: o.maxDepth,
      minSplit: o.minSplit,
      mtry,
      samplesPerClass: o.samplesPerClass,
    },
    forest: forestRecord(t.forest),
  });
}

function toCounts(n: number[]): ClassCounts {
  return { outside: n[0], rim: n[1], core: n[2] };
}
