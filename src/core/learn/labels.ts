/**
 * Label rasters: what a person marked on an image to teach the pixel classifier. One value per
 * pixel of the image: 0 unlabelled, 1 outside the fracture surface (background, holder, notch flank,
 * scale marks…), 2 smooth rim band, 3 rough core. On the command line a label image is a grey PNG
 * (or TIFF) of the image's size holding these values; the app paints them with its brushes.
 */
import type { DecodedImage } from '../decode/types.js';
import { FractozoneError } from '../errors.js';

/** The classes a model tells apart, in the order of its probabilities; label value = index + 1. */
export const CLASS_NAMES = ['outside', 'rim', 'core'] as const;

/** A class name. */
export type ClassName = (typeof CLASS_NAMES)[number];

/** Label value of "not labelled". */
export const UNLABELLED = 0;

/** Highest label value (the rough core). */
export const MAX_LABEL = CLASS_NAMES.length;

/** A label per image pixel (0 unlabelled, 1 outside, 2 rim, 3 core), row-major. */
export interface LabelRaster {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8Array;
}

/** Labelled pixels per class (outside, rim, core). */
export type ClassCounts = Record<ClassName, number>;

function bad(message: string): never {
  throw new FractozoneError('BAD_LABELS', message);
}

/**
 * Checks a label raster against its image: same size, values 0–3.
 *
 * @param labels - the labels
 * @param imageSize - the image's size in px
 * @param name - how to name the label image in a message
 * @throws FractozoneError BAD_LABELS (exit 2) naming the first problem
 */
export function checkLabels(labels: LabelRaster, imageSize: { width: number; height: number }, name = 'the label image'): LabelRaster {
  if (labels.width !== imageSize.width || labels.height !== imageSize.height) {
    bad(`${name} is ${labels.width}×${labels.height} px but its image is ${imageSize.width}×${imageSize.height} px; a label image must have the size of its image`);
  }
  if (labels.data.length !== labels.width * labels.height) bad(`${name} holds ${labels.data.length} values for ${labels.width}×${labels.height} px`);
  const d = labels.data;
  forEachLabelled(d, (i, v) => {
    if (v > MAX_LABEL) bad(`${name} holds the value ${v} at (x ${i % labels.width}, y ${Math.floor(i / labels.width)}); allowed are 0 unlabelled, 1 outside, 2 rim band, 3 core`);
  });
  return labels;
}

/**
 * A label raster from a decoded grey image (8- or 16-bit, or 1/2/4-bit): the stored integer values.
 *
 * @param decoded - the decoded label image
 * @param name - how to name it in a message
 * @throws FractozoneError BAD_LABELS for a colour or floating-point image, a lossy (JPEG) file, or
 *   values that are not whole numbers 0–3
 */
export function labelsFromDecoded(decoded: DecodedImage, name = 'the label image'): LabelRaster {
  if (decoded.format === 'jpeg') bad(`${name} is a JPEG, whose lossy compression changes label values; save it as a grey PNG`);
  if (decoded.colorType !== 'gray' && decoded.colorType !== 'gray+alpha') {
    bad(`${name} is a ${decoded.colorType} image; a label image must be grey (values 0 unlabelled, 1 outside, 2 rim band, 3 core)`);
  }
  if (decoded.sampleFormat === 'float') bad(`${name} holds floating-point samples; a label image holds whole numbers 0–3`);
  const maxValue = 2 ** decoded.bitDepth - 1;
  const { width, height, data } = decoded.raster;
  const out = new Uint8Array(width * height);
  for (let i = 0; i < data.length; i++) {
    const v = data[i] * maxValue;
    const k = Math.round(v);
    if (Math.abs(v - k) > 1e-3) bad(`${name} holds a value that is not a whole number at (x ${i % width}, y ${Math.floor(i / width)})`);
    if (k > MAX_LABEL) bad(`${name} holds the value ${k} at (x ${i % width}, y ${Math.floor(i / width)}); allowed are 0 unlabelled, 1 outside, 2 rim band, 3 core`);
    out[i] = k;
  }
  return { width, height, data: out };
}

/** Labelled pixels per class (values above 3 are not counted). */
export function countLabels(labels: LabelRaster): ClassCounts {
  const n = [0, 0, 0, 0];
  forEachLabelled(labels.data, (_, v) => {
    if (v <= MAX_LABEL) n[v]++;
  });
  return { outside: n[1], rim: n[2], core: n[3] };
}

/**
 * Calls `visit(i, value)` for every non-zero value, in index order. Labels are sparse (a few thin
 * strokes), so whole zero words of four values are skipped at once.
 */
export function forEachLabelled(data: Uint8Array, visit: (i: number, value: number) => void): void {
  const n = data.length;
  let i = 0;
  if (data.byteOffset % 4 === 0) {
    const words = new Uint32Array(data.buffer, data.byteOffset, n >> 2);
    for (let k = 0; k < words.length; k++) {
      if (words[k] === 0) continue;
      for (let j = 4 * k; j < 4 * k + 4; j++) if (data[j]) visit(j, data[j]);
    }
    i = words.length * 4;
  }
  for (; i < n; i++) if (data[i]) visit(i, data[i]);
}
