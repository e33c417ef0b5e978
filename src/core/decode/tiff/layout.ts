/**
 * What the first directory of a TIFF says about its pixels, checked: sample format and depth,
 * compression, colour model, predictor, planar configuration and the strip/tile grid. Every kind
 * fractozone cannot read is refused here with UNSUPPORTED_IMAGE, every impossible value with
 * CORRUPT_IMAGE, before any pixel buffer is allocated.
 */
import { fail } from '../fail.js';
import { COMPRESSION_NAMES, type JpegChunk } from './codecs.js';
import { one, type Ifd, type TiffStructure } from './reader.js';

export interface TiffLayout {
  width: number;
  height: number;
  /** Samples per pixel in the file (incl. extra samples such as alpha). */
  spp: number;
  bitDepth: number;
  sampleFormat: 'uint' | 'float';
  cmpr: number;
  compression: string;
  /** 0 WhiteIsZero, 1 BlackIsZero, 2 RGB, 3 palette, 6 YCbCr (JPEG only). */
  photometric: number;
  colorType: string;
  /** The first three samples are colour (RGB after JPEG decoding). */
  colour: boolean;
  predictor: number;
  /** 1 interleaved, 2 one plane per sample. */
  planar: number;
  tiled: boolean;
  tileW: number;
  tileH: number;
  across: number;
  down: number;
  offsets: number[];
  counts: number[];
  /** Parameters of the JPEG streams (compression 7), else null. */
  jpeg: JpegChunk | null;
  le: boolean;
}

/** Most samples per pixel read (gray/RGB plus extra samples). */
const MAX_SAMPLES = 16;

const PHOTOMETRIC_NAMES: Record<number, string> = { 4: 'transparency mask', 5: 'CMYK', 6: 'YCbCr', 8: 'CIE Lab', 32844: 'LogL', 32845: 'LogLuv' };

function sampleKind(ifd: Ifd): { bitDepth: number; sampleFormat: 'uint' | 'float' } {
  const bps = ifd.tags.get(258) ?? [1];
  const bitDepth = bps[0];
  if (bps.some((b) => b !== bitDepth)) fail('UNSUPPORTED_IMAGE', 'TIFF images with different bit depths per channel are not supported');
  const sf = ifd.tags.get(339) ?? [1];
  if (sf.some((v) => v !== sf[0])) fail('UNSUPPORTED_IMAGE', 'TIFF images with different sample formats per channel are not supported');
  if (sf[0] === 3) {
    if (bitDepth !== 32 && bitDepth !== 64) fail('UNSUPPORTED_IMAGE', `${bitDepth}-bit floating-point TIFF is not supported (only 32- and 64-bit)`);
    return { bitDepth, sampleFormat: 'float' };
  }
  if (sf[0] !== 1) fail('UNSUPPORTED_IMAGE', 'TIFF with signed or undefined sample format is not supported; export as unsigned 8- or 16-bit or as floating point');
  if (bitDepth !== 1 && bitDepth !== 8 && bitDepth !== 16) fail('UNSUPPORTED_IMAGE', `${bitDepth}-bit TIFF is not supported (only 1, 8 and 16 bits per integer sample)`);
  return { bitDepth, sampleFormat: 'uint' };
}

function colourModel(photometric: number, spp: number, bitDepth: number, cmpr: number): { colorType: string; colour: boolean } {
  if (photometric === 0 || photometric === 1) return { colorType: spp > 1 ? 'gray+alpha' : 'gray', colour: false };
  if (photometric === 2 || (photometric === 6 && cmpr === 7)) {
    if (spp < 3) fail('CORRUPT_IMAGE', 'the RGB TIFF has fewer than 3 samples per pixel');
    return { colorType: spp > 3 ? 'rgba' : 'rgb', colour: true };
  }
  if (photometric === 3) {
    if ((bitDepth !== 8 && bitDepth !== 16) || spp !== 1) fail('UNSUPPORTED_IMAGE', 'only 8- and 16-bit palette TIFF is supported');
    return { colorType: 'palette', colour: false };
  }
  return fail('UNSUPPORTED_IMAGE', `${PHOTOMETRIC_NAMES[photometric] ?? `photometric ${photometric}`} TIFF is not supported; save the image as gray or RGB`);
}

function checkCombination(L: Omit<TiffLayout, 'tiled' | 'tileW' | 'tileH' | 'across' | 'down' | 'offsets' | 'counts' | 'jpeg'>, ifd: Ifd): void {
  const { bitDepth, spp, sampleFormat, predictor, cmpr, photometric } = L;
  if (predictor !== 1 && predictor !== 2 && predictor !== 3) fail('UNSUPPORTED_IMAGE', `TIFF predictor ${predictor} is not supported`);
  if (predictor === 2 && (bitDepth === 1 || sampleFormat === 'float')) fail('CORRUPT_IMAGE', `the TIFF uses the integer predictor on ${bitDepth === 1 ? '1-bit' : 'floating-point'} data`);
  if (predictor === 3 && sampleFormat !== 'float') fail('CORRUPT_IMAGE', 'the TIFF uses the floating-point predictor on integer data');
  if (one(ifd, 266, 1) !== 1) fail('UNSUPPORTED_IMAGE', 'TIFF with reversed bit fill order is not supported');
  if (L.planar !== 1 && L.planar !== 2) fail('CORRUPT_IMAGE', `the TIFF planar configuration ${L.planar} is not defined`);
  if (bitDepth === 1 && (spp !== 1 || photometric > 1)) fail('UNSUPPORTED_IMAGE', 'only 1-bit bilevel gray TIFF is supported');
  if (sampleFormat === 'float' && photometric > 2) fail('UNSUPPORTED_IMAGE', 'floating-point TIFF must be gray or RGB');
  if (cmpr === 7) {
    if (bitDepth !== 8 || sampleFormat !== 'uint') fail('UNSUPPORTED_IMAGE', 'only 8-bit JPEG-compressed TIFF is supported');
    if (spp !== 1 && spp !== 3) fail('UNSUPPORTED_IMAGE', 'JPEG-compressed TIFF with extra samples (alpha) is not supported');
    if (L.planar === 2 && spp > 1) fail('UNSUPPORTED_IMAGE', 'JPEG-compressed TIFF with separate colour planes is not supported');
    if (photometric === 3 || (photometric === 0 && spp === 1)) fail('UNSUPPORTED_IMAGE', 'this JPEG-compressed TIFF colour model is not supported');
  }
}

function grid(ifd: Ifd, width: number, height: number): Pick<TiffLayout, 'tiled' | 'tileW' | 'tileH' | 'across' | 'down' | 'offsets'> & { counts: number[] | undefined } {
  const tiled = ifd.tags.has(322);
  const offsets = ifd.tags.get(tiled ? 324 : 273);
  if (!offsets || offsets.length === 0) fail('CORRUPT_IMAGE', 'the TIFF image directory has no strip or tile offsets');
  const tileW = tiled ? one(ifd, 322, 0)! : width;
  const tileH = tiled ? one(ifd, 323, 0)! : Math.min(one(ifd, 278, height)!, height);
  if (!(tileW > 0) || !(tileH > 0)) fail('CORRUPT_IMAGE', 'the TIFF tile or strip size is 0');
  // a tile may pad the image, but not by more than the image itself (the buffer is allocated from it)
  if (tileW * tileH > 4 * Math.max(width * height, 65536)) fail('CORRUPT_IMAGE', `the TIFF tile size (${tileW}×${tileH} px) is out of proportion to the image (${width}×${height} px)`);
  return { tiled, tileW, tileH, across: Math.ceil(width / tileW), down: Math.ceil(height / tileH), offsets, counts: ifd.tags.get(tiled ? 325 : 279) };
}

/** Bytes in one row of a strip or tile holding `samples` samples per pixel. */
export function chunkRowBytes(L: Pick<TiffLayout, 'tiled' | 'tileW' | 'width' | 'bitDepth'>, samples: number): number {
  return Math.ceil(((L.tiled ? L.tileW : L.width) * samples * L.bitDepth) / 8);
}

/**
 * The checked layout of the first page.
 * @throws FractozoneError UNSUPPORTED_IMAGE, CORRUPT_IMAGE, TRUNCATED_IMAGE
 */
export function describeLayout(s: TiffStructure, fileLength: number, maxPixels: number): TiffLayout {
  const { ifd, width, height, spp } = s;
  if (!(spp >= 1)) fail('CORRUPT_IMAGE', 'the TIFF gives 0 samples per pixel');
  if (spp > MAX_SAMPLES) fail('UNSUPPORTED_IMAGE', `TIFF with ${spp} samples per pixel is not supported (at most ${MAX_SAMPLES})`);
  const { bitDepth, sampleFormat } = sampleKind(ifd);
  // the sample buffer is allocated from this: at most 16 bytes per pixel of the pixel budget
  if ((width * height * spp * bitDepth) / 8 > 16 * maxPixels) {
    fail('IMAGE_TOO_LARGE', `the TIFF image needs ${Math.round((width * height * spp * bitDepth) / 8 / 1e6)} MB of samples, above the limit for ${(maxPixels / 1e6).toFixed(1)} megapixels`);
  }
  const cmpr = one(ifd, 259, 1)!;
  const compression = COMPRESSION_NAMES[cmpr];
  if (!compression) {
    const what = cmpr === 6 ? 'old-style JPEG-compressed' : `compression ${cmpr}`;
    fail('UNSUPPORTED_IMAGE', `TIFF ${what} is not supported (only none, LZW, Deflate, PackBits, JPEG)`);
  }
  const photometric = one(ifd, 262, spp >= 3 ? 2 : 1)!;
  const { colorType, colour } = colourModel(photometric, spp, bitDepth, cmpr);
  const base = { width, height, spp, bitDepth, sampleFormat, cmpr, compression, photometric, colorType, colour, predictor: one(ifd, 317, 1)!, planar: spp > 1 ? one(ifd, 284, 1)! : 1, le: s.r.le };
  checkCombination(base, ifd);
  const g = grid(ifd, width, height);
  if (g.tiled && bitDepth === 1) fail('UNSUPPORTED_IMAGE', '1-bit tiled TIFF is not supported');
  const planes = base.planar === 2 ? spp : 1;
  const nChunks = g.across * g.down * planes;
  if (g.offsets.length < nChunks) fail('CORRUPT_IMAGE', `the TIFF lists ${g.offsets.length} strips or tiles where ${nChunks} are needed`);
  let counts = g.counts;
  if (!counts) {
    if (cmpr !== 1) fail('CORRUPT_IMAGE', 'the TIFF image directory has no strip or tile byte counts');
    const each = chunkRowBytes({ ...g, width, bitDepth }, planes === 1 ? spp : 1) * g.tileH;
    counts = g.offsets.map(() => each);
  }
  if (counts.length < nChunks) fail('CORRUPT_IMAGE', 'the TIFF lists fewer byte counts than strips or tiles');
  for (let i = 0; i < nChunks; i++) {
    if (!(g.offsets[i] + counts[i] <= fileLength)) fail('TRUNCATED_IMAGE', 'the TIFF file is cut short (image data lies past its end)');
  }
  const tables = ifd.tags.get(347);
  const jpeg: JpegChunk | null =
    cmpr === 7 ? { tables: tables ? Uint8Array.from(tables) : new Uint8Array(0), width: g.tileW, height: g.tileH, spp, ycbcr: photometric === 6 } : null;
  return { ...base, ...g, counts, jpeg };
}
