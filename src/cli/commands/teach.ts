/**
 * `fractozone teach --image A.png --labels A.labels.png [--image B.png --labels B.labels.png …]
 * --out MODEL.json`: trains a pixel classifier from label images (grey, the image's size: 0
 * unlabelled, 1 outside the fracture surface, 2 smooth rim band, 3 rough core) and writes the model
 * file (fractozone.model/1). Prints the pixels per class and the out-of-bag accuracy. Every input
 * is read and checked before anything is written; the model file is written atomically.
 */
import { basename } from 'node:path';
import type { Command } from 'commander';
import { decodeImage, FractozoneError, isFractozoneError, parseLengthUm, type ScaleParams } from '../../core/index.js';
import { labelsFromDecoded } from '../../core/learn/labels.js';
import { serialiseModel, type PixelModel } from '../../core/learn/model.js';
import { TEACH_DEFAULTS, teachModel, type TeachImage } from '../../core/learn/train.js';
import { printable, printableLines } from '../../core/text/printable.js';
import { loadCvNode } from '../cvNode.js';
import { readInputFile, sha256Hex, stderrLine, toJsonText, writeFileAtomic } from '../io.js';
import { parseTwoPoint } from '../measureOptions.js';

interface Options {
  image: string[];
  labels: string[];
  out: string;
  pixelSize?: string;
  pixelSizeY?: string;
  barLength?: string;
  twoPoint?: string;
  metadata?: boolean;
  windows?: string;
  trees?: string;
  depth?: string;
  samplesPerClass?: string;
  seed?: string;
  maxPixels?: string;
  json?: boolean;
}

const collect = (v: string, prev: string[] = []): string[] => [...prev, v];

function whole(text: string | undefined, what: string, fallback: number): number {
  if (text === undefined) return fallback;
  const v = Number(text);
  if (text.trim() === '' || !Number.isInteger(v) || v < 1) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not a whole number ≥ 1`);
  return v;
}

function scaleFrom(o: Options): ScaleParams {
  const s: ScaleParams = {};
  if (o.pixelSize !== undefined) s.pixelSizeUm = parseLengthUm(o.pixelSize, '--pixel-size');
  if (o.pixelSizeY !== undefined) s.pixelSizeYUm = parseLengthUm(o.pixelSizeY, '--pixel-size-y');
  if (o.barLength !== undefined) s.barLengthUm = parseLengthUm(o.barLength, '--bar-length');
  if (o.twoPoint !== undefined) s.twoPoint = parseTwoPoint(o.twoPoint);
  s.useMetadata = o.metadata !== false;
  return s;
}

/** The label image of `path`, decoded and turned into a label raster; any failure is BAD_LABELS. */
function readLabels(path: string): { labels: ReturnType<typeof labelsFromDecoded>; sha256: string } {
  const name = `label image "${printable(path)}"`;
  try {
    const bytes = readInputFile(path);
    return { labels: labelsFromDecoded(decodeImage(bytes), name), sha256: sha256Hex(bytes) };
  } catch (e) {
    if (!isFractozoneError(e) || e.code === 'BAD_LABELS') throw e;
    throw new FractozoneError('BAD_LABELS', `${name}: ${e.message}`);
  }
}

/** What `teach` prints: pixels per class and the out-of-bag accuracy. */
export function teachSummary(m: PixelModel, out: string): string {
  const t = m.training;
  const pct = (v: number | null): string => (v === null ? '—' : `${(v * 100).toFixed(1)} %`);
  const lines = [
    `model          ${out}  (${m.schema}, ${m.forest.roots.length} trees, seed ${t.seed})`,
    `  images       ${t.images.map((i) => i.file).join(', ')}`,
    `  windows      ${m.windowsUm.map((w) => `${w} µm`).join(', ')}`,
    `  labelled px  outside ${t.labelledWorkingPixels.outside}, rim ${t.labelledWorkingPixels.rim}, core ${t.labelledWorkingPixels.core} (working copy)`,
    `  trained on   outside ${t.pixelsPerClass.outside}, rim ${t.pixelsPerClass.rim}, core ${t.pixelsPerClass.core} px`,
    `  out-of-bag   accuracy ${pct(t.oobAccuracy)} (outside ${pct(t.oobAccuracyByClass.outside)}, rim ${pct(t.oobAccuracyByClass.rim)}, core ${pct(t.oobAccuracyByClass.core)})`,
  ];
  return lines.join('\n') + '\n';
}

export function register(program: Command): void {
  program
    .command('teach')
    .description('train a pixel classifier (outside / rim band / core) from label images, for measure --model and batch --model')
    .requiredOption('--image <file>', 'a training image (repeatable; pair each with --labels)', collect, [])
    .requiredOption('--labels <file.png>', 'its label image: grey, the image\'s size, 0 unlabelled, 1 outside, 2 rim band, 3 core (repeatable)', collect, [])
    .requiredOption('--out <model.json>', 'the model file to write (fractozone.model/1)')
    .option('--pixel-size <length>', 'pixel size with unit, e.g. 4um (for every image)')
    .option('--pixel-size-y <length>', 'vertical pixel size if pixels are not square')
    .option('--bar-length <length>', 'real length of the burned-in scale bar, e.g. 500um')
    .option('--two-point <x0,y0,x1,y1,length>', 'two image points (px) and their real distance')
    .option('--no-metadata', 'ignore the pixel size in TIFF/PNG metadata')
    .option('--windows <list>', 'feature windows, e.g. 40um,80um,160um (default: ½, 1 and 2 × the default texture window of the first image)')
    .option('--trees <n>', 'number of trees', String(TEACH_DEFAULTS.nTrees))
    .option('--depth <n>', 'largest tree depth', String(TEACH_DEFAULTS.maxDepth))
    .option('--samples-per-class <n>', 'largest number of labelled pixels per class the forest is trained on', String(TEACH_DEFAULTS.samplesPerClass))
    .option('--seed <n>', 'random seed (pixel sample, bootstrap, feature subsets)', String(TEACH_DEFAULTS.seed))
    .option('--max-pixels <n>', 'refuse images larger than this many pixels', '100000000')
    .option('--json', 'print the training summary as JSON on stdout')
    .action((o: Options) => {
      if (o.image.length !== o.labels.length) {
        throw new FractozoneError('BAD_PARAMETER', `give one --labels per --image (got ${o.image.length} images and ${o.labels.length} label images)`);
      }
      const scale = scaleFrom(o);
      const windowsUm = o.windows === undefined ? null : o.windows.split(',').map((w) => parseLengthUm(w.trim(), '--windows'));
      const opts = { windowsUm, nTrees: whole(o.trees, '--trees', TEACH_DEFAULTS.nTrees), maxDepth: whole(o.depth, '--depth', TEACH_DEFAULTS.maxDepth), samplesPerClass: whole(o.samplesPerClass, '--samples-per-class', TEACH_DEFAULTS.samplesPerClass) };
      const seed = o.seed === undefined ? TEACH_DEFAULTS.seed : Number(o.seed);
      if (!Number.isInteger(seed)) throw new FractozoneError('BAD_PARAMETER', `--seed "${o.seed}" is not a whole number`);
      const maxPixels = whole(o.maxPixels, '--max-pixels', 100_000_000);
      const images: TeachImage[] = o.image.map((path, i) => {
        const bytes = readInputFile(path);
        const { labels, sha256: labelsSha256 } = readLabels(o.labels[i]);
        return { decoded: decodeImage(bytes, { maxPixels }), labels, scale, file: basename(path), sha256: sha256Hex(bytes), labelsSha256 };
      });
      loadCvNode();
      const { model } = teachModel(images, { ...opts, seed });
      writeFileAtomic(o.out, serialiseModel(model));
      if (o.json) process.stdout.write(toJsonText({ model: o.out, schema: model.schema, windowsUm: model.windowsUm, training: model.training }));
      else process.stdout.write(printableLines(teachSummary(model, o.out)));
      if (!o.json) stderrLine(`wrote ${o.out}`);
    });
}
