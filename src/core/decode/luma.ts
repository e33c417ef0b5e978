/**
 * Luminance from colour samples.
 *
 * Weights are those of ITU-R BT.709-6 (2015), Table 3 item 3.2, which are also the sRGB weights
 * (IEC 61966-2-1): Y = 0.2126 R + 0.7152 G + 0.0722 B. They are applied to the *encoded* sample
 * values, with no gamma linearisation: the texture statistics of fractozone are measured on the
 * recorded intensities, which is what a person sees on screen (strictly this is luma Y′, not
 * relative luminance Y).
 */
import { createRaster, type GrayRaster } from '../image/raster.js';

/** Rec. 709 / sRGB luma weights [R, G, B] (ITU-R BT.709-6, Table 3 item 3.2); they sum to 1. */
export const LUMA_WEIGHTS_REC709 = Object.freeze([0.2126, 0.7152, 0.0722] as const);

const WR = LUMA_WEIGHTS_REC709[0];
const WG = LUMA_WEIGHTS_REC709[1];
const WB = LUMA_WEIGHTS_REC709[2];

/**
 * Rec. 709 luma of one colour, on the encoded values (no gamma linearisation).
 *
 * @param r - red sample, any scale (e.g. 0..1 or 0..255)
 * @param g - green sample, same scale
 * @param b - blue sample, same scale
 * @returns 0.2126 r + 0.7152 g + 0.0722 b, on the input scale (ITU-R BT.709-6, Table 3 item 3.2)
 */
export function lumaFromRgb(r: number, g: number, b: number): number {
  return WR * r + WG * g + WB * b;
}

/**
 * Internal: interleaved integer samples → luminance raster 0..1.
 *
 * @param samples - interleaved samples, row-major, `spp` per pixel, `rowStride` samples per row
 * @param width - px
 * @param height - px
 * @param spp - samples per pixel in `samples` (incl. alpha, which is skipped)
 * @param colour - true: the first three samples are R, G, B; false: the first is gray
 * @param maxValue - value of full intensity (255, 65535, 2^bits − 1)
 * @param rowStride - samples per row (default width × spp)
 */
export function samplesToRaster(
  samples: ArrayLike<number>,
  width: number,
  height: number,
  spp: number,
  colour: boolean,
  maxValue: number,
  rowStride = width * spp,
): GrayRaster {
  const out = new Float32Array(width * height);
  if (maxValue <= 255 && samples instanceof Uint8Array) {
    // 8-bit fast path: per-channel look-up tables, monomorphic Uint8Array access, the row loops in
    // small functions of their own (V8 optimises them at once instead of late by on-stack replacement;
    // 12-MP gray PNG: 57–79 → 46–64 ms in a fresh process, issue 16). The gray table holds v / max
    // already rounded to float32 — the value the Float32Array store made of it before.
    if (colour) {
      const [lr, lg, lb] = [WR, WG, WB].map((w) => Float64Array.from({ length: 256 }, (_, v) => (w * v) / maxValue));
      for (let y = 0; y < height; y++) rgbRow8(samples, out, lr, lg, lb, y * rowStride, y * width, width, spp);
    } else {
      const lut = Float32Array.from({ length: 256 }, (_, v) => (1 * v) / maxValue);
      for (let y = 0; y < height; y++) grayRow8(samples, out, lut, y * rowStride, y * width, width, spp);
    }
    return createRaster(width, height, out);
  }
  const inv = 1 / maxValue;
  const wr = WR * inv;
  const wg = WG * inv;
  const wb = WB * inv;
  let o = 0;
  for (let y = 0; y < height; y++) {
    let i = y * rowStride;
    if (colour) {
      for (let x = 0; x < width; x++, i += spp) {
        out[o++] = wr * samples[i] + wg * samples[i + 1] + wb * samples[i + 2];
      }
    } else {
      for (let x = 0; x < width; x++, i += spp) out[o++] = samples[i] * inv;
    }
  }
  return createRaster(width, height, out);
}

/** One row of 8-bit gray samples through the look-up table (see `samplesToRaster`). */
function grayRow8(samples: Uint8Array, out: Float32Array, lut: Float32Array, i: number, o: number, width: number, spp: number): void {
  if (spp === 1) for (const e = o + width; o < e; o++, i++) out[o] = lut[samples[i]];
  else for (const e = o + width; o < e; o++, i += spp) out[o] = lut[samples[i]];
}

/** One row of 8-bit R, G, B samples through the per-channel tables (see `samplesToRaster`). */
function rgbRow8(
  samples: Uint8Array,
  out: Float32Array,
  lr: Float64Array,
  lg: Float64Array,
  lb: Float64Array,
  i: number,
  o: number,
  width: number,
  spp: number,
): void {
  for (const e = o + width; o < e; o++, i += spp) out[o] = lr[samples[i]] + lg[samples[i + 1]] + lb[samples[i + 2]];
}
