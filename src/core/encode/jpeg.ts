/**
 * Baseline JPEG encoder adapter (jpeg-js, a port of the JPEG encoder after ITU-T T.81 baseline
 * sequential DCT with the standard Annex K quantisation tables). Deterministic byte for byte.
 */
import jpeg from 'jpeg-js';
import { FractozoneError } from '../errors.js';
import { checkImageInput } from './png.js';

export interface JpegImageInput {
  readonly width: number;
  readonly height: number;
  /** 8-bit samples, 1 channel (gray) or 3 (RGB) or 4 (RGBA, alpha ignored), row-major */
  readonly data: Uint8Array | Uint8ClampedArray;
  readonly channels: 1 | 3 | 4;
}

/**
 * Encode a baseline JPEG.
 * @param img 8-bit gray, RGB or RGBA pixels
 * @param quality 1..100 (IJG-style scaling of the Annex K tables)
 * @returns JPEG file bytes (always 3-component YCbCr; gray input gives R = G = B)
 */
export function encodeJpeg(img: JpegImageInput, quality = 90): Uint8Array {
  if (![1, 3, 4].includes(img.channels)) throw new FractozoneError('BAD_PARAMETER', `JPEG input must have 1, 3 or 4 channels, got ${img.channels}`);
  checkImageInput(img.width, img.height, img.data, img.channels, 'JPEG');
  if (!Number.isFinite(quality) || quality < 1 || quality > 100) throw new FractozoneError('BAD_PARAMETER', `JPEG quality must be between 1 and 100, got ${quality}`);
  const n = img.width * img.height;
  const rgba = new Uint8Array(n * 4);
  const d = img.data;
  if (img.channels === 1) {
    for (let i = 0; i < n; i++) {
      const v = d[i];
      rgba[4 * i] = v;
      rgba[4 * i + 1] = v;
      rgba[4 * i + 2] = v;
      rgba[4 * i + 3] = 255;
    }
  } else if (img.channels === 3) {
    for (let i = 0; i < n; i++) {
      rgba[4 * i] = d[3 * i];
      rgba[4 * i + 1] = d[3 * i + 1];
      rgba[4 * i + 2] = d[3 * i + 2];
      rgba[4 * i + 3] = 255;
    }
  } else rgba.set(d);
  const out = jpeg.encode({ width: img.width, height: img.height, data: rgba }, Math.round(quality));
  const b = out.data as Uint8Array;
  return new Uint8Array(b.buffer, b.byteOffset, b.byteLength).slice();
}
