/**
 * Teaching: a pixel classifier from one or more images with label rasters. Each image goes through
 * the measurement's own first stages (scale and scale-mark detection, the working copy with the
 * marks painted out), so the features the model learns from are those `measure` computes later.
 * Labelled full-resolution pixels are carried to the working copy (a working pixel takes a label
 * when every labelled pixel it covers has the same one); a seeded subsample of at most
 * `samplesPerClass` pixels per class trains the forest (classes balanced by weight, learn/forest.ts).
 */
import type { DecodedImage } from '../decode/types.js';
import { FractozoneError } from '../errors.js';
import { WorkingFrame } from '../pipeline/frame.js';
import { calibrate } from '../pipeline/stages/calibrate.js';
import type { ScaleParams } from '../pipeline/types.js';
import { createRng } from '../random.js';
import { defaultWindowUm } from '../texture/window.js';
import { computePixelFeatures, featureCentre, PIXEL_FEATURE_SET, pixelFeatureNames } from './features.js';
import { trainForest } from './forest.js';
import { CLASS_NAMES, checkLabels, countLabels, type ClassCounts, type LabelRaster } from './labels.js';
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
  for (let y = 0; y < labels.height; y++) {
    const row = Math.min(h - 1, Math.floor(y / frame.sy)) * w;
    const off = y * labels.width;
    for (let x = 0; x < labels.width; x++) {
      const v = labels.data[off + x];
      if (v) seen[row + colOf[x]] |= 1 << v;
    }
  }
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

function defaultWindows(frame: WorkingFrame, umPerPx: number): number[] {
  const base = defaultWindowUm({ umPerPx, imageWidthPx: frame.full.width, imageHeightPx: frame.full.height, scaleFactor: frame.factor });
  return [0.5, 1, 2].map((k) => Math.round(base * k * 10) / 10);
}

/** A class without any labelled pixel stops the teaching. */
function checkClasses(counts: ClassCounts, where: string): void {
  for (const [k, c] of CLASS_NAMES.entries()) {
    if (counts[c] === 0) throw new FractozoneError('BAD_LABELS', `no pixel is labelled ${c} (value ${k + 1}) ${where}; every class needs some labelled pixels`);
  }
}

/** Per-image part of teaching: features of the labelled working pixels. */
function imageSamples(img: TeachImage, windowsUm: number[] | null): { rows: Float32Array[]; cls: Uint8Array; windowsUm: number[]; record: ModelTrainingImage } {
  const calibration = calibrate({ decoded: img.decoded, scale: img.scale });
  const frame = new WorkingFrame(img.decoded.raster, calibration.marks);
  const umPerWorkPx = calibration.scale.umPerPx * frame.lengthScale;
  const windows = windowsUm ?? defaultWindows(frame, calibration.scale.umPerPx);
  const wl = workingLabels(img.labels, frame);
  const features = computePixelFeatures(frame.work, umPerWorkPx, windows, featureCentre(frame));
  const F = features.maps.length;
  const rows = Array.from(wl.index, (i) => Float32Array.from({ length: F }, (_, k) => features.maps[k][i]));
  return {
    rows,
    cls: wl.cls,
    windowsUm: windows,
    record: { file: img.file, sha256: img.sha256, labelsSha256: img.labelsSha256, umPerPx: calibration.scale.umPerPx, labelledPixels: countLabels(img.labels) },
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
  const rows: Float32Array[] = [];
  const cls: number[] = [];
  const records: ModelTrainingImage[] = [];
  const labelName = (i: number): string => (images.length > 1 ? `the label image of image ${i + 1} (${images[i].file})` : 'the label image');
  const total = [0, 0, 0];
  for (const [i, img] of images.entries()) {
    checkLabels(img.labels, { width: img.decoded.widthPx, height: img.decoded.heightPx }, labelName(i));
    CLASS_NAMES.forEach((c, k) => (total[k] += countLabels(img.labels)[c]));
  }
  checkClasses(toCounts(total), images.length > 1 ? 'in any label image' : 'in the label image');
  for (const img of images) {
    const s = imageSamples(img, windowsUm);
    windowsUm = s.windowsUm;
    rows.push(...s.rows);
    cls.push(...s.cls);
    records.push(s.record);
  }
  const tFeatures = performance.now();
  return { model: fit(rows, Uint8Array.from(cls), windowsUm as number[], records, o), timingsMs: { features: Math.round(tFeatures - t0), forest: Math.round(performance.now() - tFeatures) } };
}

/** Seeded balanced subsample, the forest, the sealed model. */
function fit(rows: Float32Array[], cls: Uint8Array, windowsUm: number[], images: ModelTrainingImage[], o: typeof TEACH_DEFAULTS): PixelModel {
  const C = CLASS_NAMES.length;
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
  const F = rows[0].length;
  const X = new Float32Array(all.length * F);
  const y = new Uint8Array(all.length);
  all.forEach((r, k) => {
    X.set(rows[r], k * F);
    y[k] = cls[r];
  });
  const mtry = Math.ceil(Math.sqrt(F));
  const t = trainForest(X, y, F, C, { nTrees: o.nTrees, maxDepth: o.maxDepth, minSplit: o.minSplit, mtry, seed: o.seed });
  const r6 = (v: number): number | null => (Number.isFinite(v) ? Math.round(v * 1e6) / 1e6 : null);
  return sealModel({
    featureSet: PIXEL_FEATURE_SET,
    features: pixelFeatureNames(windowsUm),
    windowsUm,
    classes: [...CLASS_NAMES],
    training: {
      images,
      labelledWorkingPixels,
      pixelsPerClass: toCounts(chosen.map((l) => l.length)),
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
