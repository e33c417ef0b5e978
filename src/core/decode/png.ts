/**
 * PNG adapter (PNG specification, W3C Recommendation, 2nd ed. 2003) on top of `fast-png`.
 * Bit depths 1/2/4/8/16; gray, gray+alpha, RGB, RGBA, palette (incl. tRNS); Adam7 interlace.
 * The chunk structure is walked first (cheap) so that truncation, a zero size and an oversized
 * image are refused before any pixel buffer is allocated; CRCs are checked by fast-png.
 */
import { decode as fastPngDecode } from 'fast-png';
import { metadataScaleFromPng } from '../calibrate/metadata.js';
import type { GrayRaster } from '../image/raster.js';
import { checkSize, fail, guard } from './fail.js';
import { samplesToRaster, LUMA_WEIGHTS_REC709 } from './luma.js';
import { createRaster } from '../image/raster.js';
import type { DecodedImage, ImageHeader } from './types.js';

const COLOR_NAMES: Record<number, string> = { 0: 'gray', 2: 'rgb', 3: 'palette', 4: 'gray+alpha', 6: 'rgba' };
const COLOR_SAMPLES: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };
const VALID_DEPTHS: Record<number, number[]> = { 0: [1, 2, 4, 8, 16], 2: [8, 16], 3: [1, 2, 4, 8], 4: [8, 16], 6: [8, 16] };

interface PngStructure {
  width: number;
  height: number;
  bitDepth: number;
  colorType: number;
  hasTrns: boolean;
}

function u32(b: Uint8Array, o: number): number {
  return ((b[o] << 24) >>> 0) + (b[o + 1] << 16) + (b[o + 2] << 8) + b[o + 3];
}

function chunkType(b: Uint8Array, o: number): string {
  return String.fromCharCode(b[o], b[o + 1], b[o + 2], b[o + 3]);
}

/** Read IHDR and, when `walk`, every chunk boundary up to IEND (no decompression). */
function readStructure(bytes: Uint8Array, walk: boolean, maxPixels: number): PngStructure {
  if (bytes.length < 33) fail('TRUNCATED_IMAGE', 'the PNG file ends inside its header');
  if (u32(bytes, 8) !== 13 || chunkType(bytes, 12) !== 'IHDR') {
    fail('CORRUPT_IMAGE', 'the PNG file does not start with an IHDR chunk');
  }
  const width = u32(bytes, 16);
  const height = u32(bytes, 20);
  const bitDepth = bytes[24];
  const colorType = bytes[25];
  if (!(colorType in COLOR_NAMES)) fail('CORRUPT_IMAGE', `the PNG colour type ${colorType} is not defined`);
  if (!VALID_DEPTHS[colorType].includes(bitDepth)) {
    fail('CORRUPT_IMAGE', `the PNG bit depth ${bitDepth} is not allowed for colour type ${COLOR_NAMES[colorType]}`);
  }
  checkSize('PNG', width, height, maxPixels); // before anything else is read or allocated
  let hasTrns = false;
  let off = 8;
  let sawIdat = false;
  for (;;) {
    if (off + 12 > bytes.length) {
      if (!walk && sawIdat) break;
      fail('TRUNCATED_IMAGE', 'the PNG file is cut short (a chunk or the IEND end marker is missing)');
    }
    const len = u32(bytes, off);
    const type = chunkType(bytes, off + 4);
    if (len > 0x7fffffff) fail('CORRUPT_IMAGE', `the PNG chunk "${type}" has an impossible length`);
    if (off + 12 + len > bytes.length) {
      if (!walk && sawIdat) break;
      fail('TRUNCATED_IMAGE', `the PNG file is cut short inside its "${type}" chunk`);
    }
    if (type === 'tRNS') hasTrns = true;
    if (type === 'IDAT') {
      sawIdat = true;
      if (!walk) break; // header read only: ancillary chunks before IDAT are what we need
    }
    off += 12 + len;
    if (type === 'IEND') break;
  }
  if (walk && !sawIdat) fail('CORRUPT_IMAGE', 'the PNG file holds no image data (no IDAT chunk)');
  return { width, height, bitDepth, colorType, hasTrns };
}

function channelsOf(s: PngStructure): number {
  if (s.colorType === 3) return s.hasTrns ? 4 : 3;
  return COLOR_SAMPLES[s.colorType];
}

/** Internal: cheap header read (IHDR, plus a scan of chunks before IDAT for tRNS). */
export function readPngHeader(bytes: Uint8Array): ImageHeader {
  const s = readStructure(bytes, false, Number.POSITIVE_INFINITY);
  return { format: 'png', widthPx: s.width, heightPx: s.height, bitDepth: s.bitDepth, channels: channelsOf(s) };
}

/** Unpack 1/2/4-bit rows (MSB first, rows padded to a byte) into one value per sample. */
function unpackLowDepth(packed: ArrayLike<number>, width: number, height: number, depth: number): Uint8Array {
  const out = new Uint8Array(width * height);
  const rowBytes = Math.ceil((width * depth) / 8);
  const mask = (1 << depth) - 1;
  let o = 0;
  for (let y = 0; y < height; y++) {
    const r = y * rowBytes;
    for (let x = 0; x < width; x++) {
      const bit = x * depth;
      out[o++] = (packed[r + (bit >> 3)] >> (8 - depth - (bit & 7))) & mask;
    }
  }
  return out;
}

function paletteToRaster(indices: Uint8Array, width: number, height: number, palette: number[][]): GrayRaster {
  const [wr, wg, wb] = LUMA_WEIGHTS_REC709;
  const lut = new Float32Array(256).fill(Number.NaN);
  for (let i = 0; i < palette.length && i < 256; i++) {
    const c = palette[i];
    lut[i] = (wr * c[0] + wg * c[1] + wb * c[2]) / 255;
  }
  const out = new Float32Array(width * height);
  for (let i = 0; i < out.length; i++) {
    const v = lut[indices[i]];
    if (v !== v) fail('CORRUPT_IMAGE', `the PNG uses palette entry ${indices[i]} but the palette has ${palette.length} entries`);
    out[i] = v;
  }
  return createRaster(width, height, out);
}

/** Internal: full PNG decode (call through decodeImage). */
export function decodePngImage(bytes: Uint8Array, maxPixels: number): DecodedImage {
  const s = readStructure(bytes, true, maxPixels);
  const png = guard('PNG', () => fastPngDecode(bytes, { checkCrc: true }));
  const { width, height } = s;
  if (png.width !== width || png.height !== height || png.depth !== s.bitDepth) {
    fail('CORRUPT_IMAGE', 'the PNG decoder disagrees with the IHDR header');
  }
  const samplesPerPixel = COLOR_SAMPLES[s.colorType];
  let raster: GrayRaster;
  if (s.colorType === 3) {
    if (!png.palette || png.palette.length === 0) fail('CORRUPT_IMAGE', 'the palette PNG has no PLTE chunk');
    const indices = s.bitDepth < 8 ? unpackLowDepth(png.data, width, height, s.bitDepth) : (png.data as Uint8Array);
    if (indices.length < width * height) fail('CORRUPT_IMAGE', 'the PNG image data is shorter than its size');
    raster = paletteToRaster(indices, width, height, png.palette);
  } else {
    const samples = s.bitDepth < 8 ? unpackLowDepth(png.data, width, height, s.bitDepth) : png.data;
    if (samples.length < width * height * samplesPerPixel) fail('CORRUPT_IMAGE', 'the PNG image data is shorter than its size');
    const colour = s.colorType === 2 || s.colorType === 6;
    raster = samplesToRaster(samples, width, height, samplesPerPixel, colour, 2 ** s.bitDepth - 1);
  }
  const meta = metadataScaleFromPng(png.resolution);
  return {
    format: 'png',
    widthPx: width,
    heightPx: height,
    bitDepth: s.bitDepth,
    channels: channelsOf(s),
    colorType: COLOR_NAMES[s.colorType],
    pageCount: 1,
    compression: 'deflate',
    raster,
    metadataScale: meta.scale,
    ...(meta.note !== undefined ? { metadataNote: meta.note } : {}),
  };
}
