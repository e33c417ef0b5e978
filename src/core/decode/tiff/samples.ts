/**
 * Assembled TIFF samples → luminance raster 0..1: integer samples divided by 2^bits − 1, palette
 * through the colour map, RGB by the Rec. 709 weights (luma.ts), WhiteIsZero inverted.
 *
 * Floating-point samples have no fixed full scale, so they are scaled by the file's own range:
 * the luma (or gray value) of every pixel is computed on the stored values, then mapped linearly
 * so that the smallest value becomes 0 and the largest 1 (a constant image becomes 0). The texture
 * features and the outline threshold are invariant to such a linear map up to their documented
 * brightness normalisation, so this choice does not move the measured boundary. A file with a
 * non-finite sample (NaN, ±infinity: e.g. masked pixels) is refused rather than guessed.
 */
import { createRaster, type GrayRaster } from '../../image/raster.js';
import { fail } from '../fail.js';
import { LUMA_WEIGHTS_REC709, samplesToRaster } from '../luma.js';
import type { Ifd } from './reader.js';
import type { TiffLayout } from './layout.js';

/** The value range a floating-point image was scaled from. */
export interface FloatScaling {
  minValue: number;
  maxValue: number;
}

function bilevel(px: Uint8Array, width: number, height: number): GrayRaster {
  const rowBytes = Math.ceil(width / 8);
  const out = new Float32Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) out[y * width + x] = (px[y * rowBytes + (x >> 3)] >> (7 - (x & 7))) & 1;
  return createRaster(width, height, out);
}

function palette(px: Uint8Array, L: TiffLayout, ifd: Ifd): GrayRaster {
  const map = ifd.tags.get(320);
  const n = 1 << L.bitDepth;
  if (!map || map.length < 3 * n) fail('CORRUPT_IMAGE', 'the palette TIFF has no complete colour map');
  const [wr, wg, wb] = LUMA_WEIGHTS_REC709;
  const lut = new Float32Array(n);
  for (let i = 0; i < n; i++) lut[i] = (wr * map[i] + wg * map[n + i] + wb * map[2 * n + i]) / 65535;
  const out = new Float32Array(L.width * L.height);
  for (let i = 0; i < out.length; i++) out[i] = lut[L.bitDepth === 8 ? px[i] : px[2 * i] | (px[2 * i + 1] << 8)];
  return createRaster(L.width, L.height, out);
}

function floating(px: Uint8Array, L: TiffLayout): { raster: GrayRaster; scaling: FloatScaling } {
  const n = L.width * L.height;
  const dv = new DataView(px.buffer, px.byteOffset, px.byteLength);
  const bps = L.bitDepth / 8;
  const at = (k: number): number => (bps === 4 ? dv.getFloat32(k * 4, true) : dv.getFloat64(k * 8, true));
  const [wr, wg, wb] = LUMA_WEIGHTS_REC709;
  const v = new Float64Array(n);
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  let bad = 0;
  for (let i = 0; i < n; i++) {
    const o = i * L.spp;
    const y = L.colour ? wr * at(o) + wg * at(o + 1) + wb * at(o + 2) : at(o);
    if (!Number.isFinite(y)) bad++;
    else if (y < lo) lo = y;
    if (y > hi && Number.isFinite(y)) hi = y;
    v[i] = y;
  }
  if (bad > 0) fail('UNSUPPORTED_IMAGE', `the floating-point TIFF holds ${bad} pixel${bad === 1 ? '' : 's'} that are not finite numbers (NaN or infinity); replace them before measuring`);
  const span = hi - lo;
  const out = new Float32Array(n);
  if (span > 0) for (let i = 0; i < n; i++) out[i] = (v[i] - lo) / span;
  if (L.photometric === 0) for (let i = 0; i < n; i++) out[i] = 1 - out[i];
  return { raster: createRaster(L.width, L.height, out), scaling: { minValue: lo, maxValue: hi } };
}

/** Luminance raster of the assembled samples (and the range floats were scaled from). */
export function toRaster(px: Uint8Array, L: TiffLayout, ifd: Ifd): { raster: GrayRaster; scaling: FloatScaling | null } {
  if (L.sampleFormat === 'float') return floating(px, L);
  const rowBytes = Math.ceil((L.width * L.spp * L.bitDepth) / 8);
  let raster: GrayRaster;
  if (L.bitDepth === 1) raster = bilevel(px, L.width, L.height);
  else if (L.photometric === 3) raster = palette(px, L, ifd);
  else if (L.bitDepth === 8) raster = samplesToRaster(px, L.width, L.height, L.spp, L.colour, 255, rowBytes);
  else {
    // little-endian pairs after assembly, put together by hand (host byte order does not matter)
    const samples = new Uint16Array(px.length >> 1);
    for (let i = 0, j = 0; i < samples.length; i++, j += 2) samples[i] = px[j] | (px[j + 1] << 8);
    raster = samplesToRaster(samples, L.width, L.height, L.spp, L.colour, 65535, rowBytes >> 1);
  }
  if (L.photometric === 0) {
    const d = raster.data;
    for (let i = 0; i < d.length; i++) d[i] = 1 - d[i];
  }
  return { raster, scaling: null };
}
