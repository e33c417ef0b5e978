/**
 * The model file `fractozone.model/1`: a trained pixel classifier with everything needed to apply
 * it to another image and to know where it came from — the feature set and its windows in µm, the
 * class names, the forest, the training summary (labelled and sampled pixels per class, out-of-bag
 * accuracy, the training images' SHA-256 and pixel sizes, the forest settings and seed) and the tool
 * version. The same labels, images and seed give the same bytes (no time stamps; numbers printed
 * by one rule). A CRC-32 (ISO 3309, as PNG uses it) over the content catches a damaged file.
 */
import { crc32 } from '../encode/png.js';
import { FractozoneError } from '../errors.js';
import { TOOL_NAME, TOOL_VERSION } from '../version.js';
import { PIXEL_FEATURE_SET, pixelFeatureNames } from './features.js';
import type { Forest } from './forest.js';
import { CLASS_NAMES, type ClassCounts, type ClassName } from './labels.js';

/** Schema name and version of a model file. */
export const MODEL_SCHEMA = 'fractozone.model/1' as const;

/** One image the model was trained on. */
export interface ModelTrainingImage {
  /** File name as given. */
  file: string;
  /** SHA-256 of the image file's bytes, hex. */
  sha256: string;
  /** SHA-256 of the label file's bytes, hex. */
  labelsSha256: string;
  /** Pixel size used, µm per px. */
  umPerPx: number;
  /** Labelled pixels per class at full resolution. */
  labelledPixels: ClassCounts;
}

/** How the model was trained and how well it fits its own labels. */
export interface ModelTraining {
  images: ModelTrainingImage[];
  /** Labelled working-copy pixels per class (over all images) the samples were drawn from. */
  labelledWorkingPixels: ClassCounts;
  /** Pixels per class the forest was trained on (a seeded subsample). */
  pixelsPerClass: ClassCounts;
  /** Out-of-bag accuracy: the fraction of training pixels the trees that did not see them classify correctly. */
  oobAccuracy: number;
  oobAccuracyByClass: Record<ClassName, number | null>;
  /** Forest settings. */
  seed: number;
  nTrees: number;
  maxDepth: number;
  minSplit: number;
  /** Features tried per split. */
  mtry: number;
  /** Upper limit of sampled pixels per class. */
  samplesPerClass: number;
}

/** The forest as stored: flat arrays over every node of every tree; split nodes have feature ≥ 0, leaves −1. */
export interface ForestRecord {
  nFeatures: number;
  nClasses: number;
  roots: number[];
  feature: number[];
  /** A split sends x < threshold to `left`; float32 values. */
  threshold: number[];
  left: number[];
  right: number[];
  /** Class distribution of each node (nClasses per node; zeros for split nodes), rounded to 1e-6. */
  value: number[];
}

/** A model file's content. */
export interface PixelModel {
  schema: typeof MODEL_SCHEMA;
  tool: { name: string; version: string };
  featureSet: typeof PIXEL_FEATURE_SET;
  /** Feature names in the order of the feature vector. */
  features: string[];
  /** The windows the features are computed at, µm. */
  windowsUm: number[];
  /** Class names in the order of the probabilities; label value = index + 1. */
  classes: ClassName[];
  training: ModelTraining;
  forest: ForestRecord;
  /** "crc32:xxxxxxxx" over the compact JSON of every other field. */
  checksum: string;
}

/** Shortest decimal that reads back as the same float32. */
function f32(v: number): number {
  for (let p = 6; p < 10; p++) {
    const s = Number(v.toPrecision(p));
    if (Math.fround(s) === v) return s;
  }
  return v;
}

/** The forest as stored (thresholds as float32 decimals, distributions rounded to 1e-6). */
export function forestRecord(f: Forest): ForestRecord {
  return {
    nFeatures: f.nFeatures,
    nClasses: f.nClasses,
    roots: Array.from(f.roots),
    feature: Array.from(f.feature),
    threshold: Array.from(f.threshold, (t, k) => (f.feature[k] >= 0 ? f32(t) : 0)),
    left: Array.from(f.left),
    right: Array.from(f.right),
    value: Array.from(f.value, (v) => Math.round(v * 1e6) / 1e6),
  };
}

/** The runtime forest of a stored one. */
export function forestFromRecord(r: ForestRecord): Forest {
  return {
    nFeatures: r.nFeatures,
    nClasses: r.nClasses,
    roots: Int32Array.from(r.roots),
    feature: Int16Array.from(r.feature),
    threshold: Float32Array.from(r.threshold),
    left: Int32Array.from(r.left),
    right: Int32Array.from(r.right),
    value: Float32Array.from(r.value),
  };
}

function checksumOf(m: Omit<PixelModel, 'checksum'>): string {
  const body = JSON.stringify({ ...m, checksum: undefined });
  return `crc32:${crc32(new TextEncoder().encode(body)).toString(16).padStart(8, '0')}`;
}

/** A model with its checksum set (the fields in the documented order). */
export function sealModel(m: Omit<PixelModel, 'checksum' | 'schema' | 'tool'>): PixelModel {
  const body = {
    schema: MODEL_SCHEMA,
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    featureSet: m.featureSet,
    features: m.features,
    windowsUm: m.windowsUm,
    classes: m.classes,
    training: m.training,
    forest: m.forest,
  };
  return { ...body, checksum: checksumOf(body) };
}

/** The model file's text: indented JSON with each forest array on one line; ends with a newline. */
export function serialiseModel(m: PixelModel): string {
  const { forest, checksum, ...head } = m;
  const headText = JSON.stringify(head, null, 2);
  const arrays = (Object.keys(forest) as (keyof ForestRecord)[]).map((k) => `    ${JSON.stringify(k)}: ${JSON.stringify(forest[k])}`).join(',\n');
  return `${headText.slice(0, -2)},\n  "forest": {\n${arrays}\n  },\n  "checksum": ${JSON.stringify(checksum)}\n}\n`;
}

function bad(message: string): never {
  throw new FractozoneError('BAD_MODEL', message);
}

function isRecord(v: unknown): v is { [key: string]: unknown } {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function numberArray(v: unknown, what: string, n?: number): number[] {
  if (!Array.isArray(v) || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) bad(`the model's ${what} is not a list of numbers`);
  if (n !== undefined && v.length !== n) bad(`the model's ${what} has ${v.length} entries, expected ${n}`);
  return v as number[];
}

/** Every node is reached once from one root, children lie after their parent, leaves hold distributions. */
function checkForest(f: ForestRecord, nFeatures: number, nClasses: number): void {
  if (f.nFeatures !== nFeatures || f.nClasses !== nClasses) bad('the forest does not match the model\'s features or classes');
  const n = numberArray(f.feature, 'forest.feature').length;
  for (const k of ['threshold', 'left', 'right'] as const) numberArray(f[k], `forest.${k}`, n);
  numberArray(f.value, 'forest.value', n * nClasses);
  const roots = numberArray(f.roots, 'forest.roots');
  if (roots.length === 0) bad('the forest has no trees');
  const parents = new Uint8Array(n);
  for (const r of roots) {
    if (!Number.isInteger(r) || r < 0 || r >= n || parents[r]) bad('the forest\'s tree roots are not valid nodes');
    parents[r] = 1;
  }
  for (let k = 0; k < n; k++) {
    const feat = f.feature[k];
    if (feat === -1) {
      let s = 0;
      for (let c = 0; c < nClasses; c++) {
        const v = f.value[k * nClasses + c];
        if (v < 0 || v > 1) bad(`forest node ${k} holds a class share outside 0..1`);
        s += v;
      }
      if (Math.abs(s - 1) > 1e-4) bad(`forest node ${k}'s class shares do not add up to 1`);
      continue;
    }
    if (!Number.isInteger(feat) || feat < 0 || feat >= nFeatures) bad(`forest node ${k} splits on a feature that does not exist`);
    for (const c of [f.left[k], f.right[k]]) {
      if (!Number.isInteger(c) || c <= k || c >= n || parents[c]) bad(`forest node ${k} has a child that is not a valid node`);
      parents[c] = 1;
    }
  }
  if (parents.some((p) => p === 0)) bad('the forest holds nodes that belong to no tree');
}

function checkHead(o: { [key: string]: unknown }): void {
  if (o.schema !== MODEL_SCHEMA) {
    if (typeof o.schema === 'string' && o.schema.startsWith('fractozone.model/')) bad(`the model file is of version "${o.schema}"; this fractozone reads ${MODEL_SCHEMA}`);
    bad('this is not a fractozone model file (no "schema": "fractozone.model/1")');
  }
  if (typeof o.checksum !== 'string' || !isRecord(o.forest) || !isRecord(o.training)) bad('the model file is incomplete (checksum, training or forest missing)');
  const { checksum, ...rest } = o;
  const body = JSON.stringify({ ...rest, checksum: undefined });
  if (`crc32:${crc32(new TextEncoder().encode(body)).toString(16).padStart(8, '0')}` !== checksum) bad('the model file is damaged: its checksum does not match its content');
  if (o.featureSet !== PIXEL_FEATURE_SET) bad(`the model was made with the feature set "${String(o.featureSet)}"; this fractozone computes ${PIXEL_FEATURE_SET}`);
}

/**
 * Reads and checks a model file's text.
 *
 * @param text - the file's content
 * @throws FractozoneError BAD_MODEL (exit 2) for text that is not JSON, another schema version, a
 *   checksum that does not match, another feature set, or a forest that is not a set of valid trees
 */
export function parseModel(text: string): PixelModel {
  let o: unknown;
  try {
    o = JSON.parse(text);
  } catch (e) {
    bad(`the model file is not valid JSON (damaged or cut short): ${(e as Error).message}`);
  }
  if (!isRecord(o)) bad('this is not a fractozone model file (no JSON object)');
  checkHead(o);
  const windowsUm = numberArray(o.windowsUm, 'windowsUm');
  if (!windowsUm.length || windowsUm.some((w) => w <= 0)) bad('the model\'s windows must be positive lengths in µm');
  const names = pixelFeatureNames(windowsUm);
  if (!Array.isArray(o.features) || o.features.join('\n') !== names.join('\n')) bad('the model\'s feature list does not match its feature set and windows');
  if (!Array.isArray(o.classes) || o.classes.join('\n') !== CLASS_NAMES.join('\n')) bad(`the model's classes must be ${CLASS_NAMES.join(', ')}`);
  const m = o as unknown as PixelModel;
  checkForest(m.forest, names.length, CLASS_NAMES.length);
  return m;
}
