/**
 * TIFF adapter (TIFF Revision 6.0, Adobe 1992). Reads the first image directory (page) of a
 * little- or big-endian classic TIFF: 1-, 8- and 16-bit unsigned samples; gray (BlackIsZero,
 * WhiteIsZero), RGB, palette; extra (alpha) samples skipped; strips or tiles; compression none,
 * LZW, Deflate (Adobe and old code), PackBits; horizontal predictor 2.
 *
 * The directory parser, strip/tile assembly, LZW and PackBits decoders, predictor and byte-order
 * handling are our own (bounded loops; utif2's LZW can loop for ever on a corrupt code stream and its
 * tiled path prints to stdout); inflation of Deflate data goes through utif2's bundled pako. 16-bit
 * samples keep full precision (value / 65535). Refused: BigTIFF, floating-point or signed samples,
 * CMYK / YCbCr / Lab, JPEG-in-TIFF, planar configuration 2, bit depths other than 1/8/16.
 */
import * as utifNs from 'utif2';
import { metadataScaleFromTiff } from '../calibrate/metadata.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { checkSize, fail, guard } from './fail.js';
import { LUMA_WEIGHTS_REC709, samplesToRaster } from './luma.js';
import type { DecodedImage, ImageHeader } from './types.js';

type Decompress = (
  img: Record<string, unknown>,
  ifds: unknown[],
  data: Uint8Array,
  off: number,
  len: number,
  cmpr: number,
  tgt: Uint8Array,
  toff: number,
  fo: number,
  w: number,
  h: number,
) => void;

interface UtifLike {
  decode: { _decompress: Decompress };
}
const UTIF: UtifLike = ((utifNs as unknown as { default?: UtifLike }).default ?? (utifNs as unknown as UtifLike));

const TYPE_SIZE = [0, 1, 1, 2, 4, 8, 1, 1, 2, 4, 8, 4, 8, 4];
const MAX_PAGES = 100_000;
const COMPRESSION_NAMES: Record<number, string> = { 1: 'none', 5: 'lzw', 8: 'deflate', 32946: 'deflate', 32773: 'packbits' };
const WANTED = new Set([256, 257, 258, 259, 262, 266, 273, 277, 278, 279, 282, 283, 284, 296, 317, 320, 322, 323, 324, 325, 338, 339]);

interface Ifd {
  tags: Map<number, number[]>;
  next: number;
}

class Reader {
  constructor(
    readonly b: Uint8Array,
    readonly le: boolean,
  ) {}
  u16(o: number): number {
    const b = this.b;
    return this.le ? b[o] | (b[o + 1] << 8) : (b[o] << 8) | b[o + 1];
  }
  u32(o: number): number {
    const b = this.b;
    return this.le
      ? (b[o] | (b[o + 1] << 8) | (b[o + 2] << 16)) + b[o + 3] * 16777216
      : b[o] * 16777216 + ((b[o + 1] << 16) | (b[o + 2] << 8) | b[o + 3]);
  }
}

function readIfd(r: Reader, off: number, readValues: boolean): Ifd {
  const n = r.b.length;
  if (off + 2 > n) fail('TRUNCATED_IMAGE', 'the TIFF file is cut short (an image directory lies past its end)');
  const count = r.u16(off);
  if (off + 2 + count * 12 + 4 > n) fail('TRUNCATED_IMAGE', 'the TIFF file is cut short inside an image directory');
  const tags = new Map<number, number[]>();
  if (readValues) {
    for (let k = 0; k < count; k++) {
      const e = off + 2 + k * 12;
      const tag = r.u16(e);
      if (!WANTED.has(tag)) continue;
      const type = r.u16(e + 2);
      const cnt = r.u32(e + 4);
      const size = TYPE_SIZE[type] ?? 0;
      if (size === 0) fail('CORRUPT_IMAGE', `the TIFF tag ${tag} has an unknown field type ${type}`);
      if (cnt > 1 << 26) fail('CORRUPT_IMAGE', `the TIFF tag ${tag} has an impossible number of values`);
      const bytes = size * cnt;
      const vo = bytes <= 4 ? e + 8 : r.u32(e + 8);
      if (vo + bytes > n) fail('TRUNCATED_IMAGE', `the TIFF file is cut short (the values of tag ${tag} lie past its end)`);
      const vals = new Array<number>(cnt);
      for (let i = 0; i < cnt; i++) {
        const p = vo + i * size;
        switch (type) {
          case 1:
          case 6:
          case 7:
          case 2:
            vals[i] = r.b[p];
            break;
          case 3:
          case 8:
            vals[i] = r.u16(p);
            break;
          case 4:
          case 9:
          case 13:
            vals[i] = r.u32(p);
            break;
          case 5:
          case 10: {
            const den = r.u32(p + 4);
            vals[i] = den === 0 ? Number.NaN : r.u32(p) / den;
            break;
          }
          default:
            vals[i] = Number.NaN; // FLOAT / DOUBLE: not used by any tag we read
        }
      }
      tags.set(tag, vals);
    }
  }
  return { tags, next: r.u32(off + 2 + count * 12) };
}

interface TiffStructure {
  r: Reader;
  ifd: Ifd;
  pageCount: number;
  width: number;
  height: number;
  bitDepth: number;
  spp: number;
}

function one(ifd: Ifd, tag: number, dflt?: number): number | undefined {
  const v = ifd.tags.get(tag);
  return v && v.length > 0 ? v[0] : dflt;
}

function readStructure(bytes: Uint8Array, countPages: boolean, maxPixels: number): TiffStructure {
  if (bytes.length < 8) fail('TRUNCATED_IMAGE', 'the TIFF file ends inside its header');
  const le = bytes[0] === 0x49;
  const r = new Reader(bytes, le);
  const magic = r.u16(2);
  if (magic === 43) fail('UNSUPPORTED_IMAGE', 'BigTIFF files are not supported; save the image as a classic TIFF');
  if (magic !== 42) fail('NOT_AN_IMAGE', 'the file is not a TIFF image');
  const first = r.u32(4);
  if (first < 8) fail('CORRUPT_IMAGE', 'the TIFF header points to an impossible image directory');
  const ifd = readIfd(r, first, true);
  const width = one(ifd, 256, 0)!;
  const height = one(ifd, 257, 0)!;
  checkSize('TIFF', width, height, maxPixels);
  const spp = one(ifd, 277, 1)!;
  const bitDepth = one(ifd, 258, 1)!;
  let pageCount = 1;
  if (countPages) {
    const seen = new Set<number>([first]);
    let next = ifd.next;
    while (next !== 0) {
      if (seen.has(next)) fail('CORRUPT_IMAGE', 'the TIFF image directories form a loop');
      if (pageCount >= MAX_PAGES) fail('CORRUPT_IMAGE', `the TIFF file claims more than ${MAX_PAGES} pages`);
      seen.add(next);
      next = readIfd(r, next, false).next;
      pageCount++;
    }
  }
  return { r, ifd, pageCount, width, height, bitDepth, spp };
}

/** Internal: cheap header read (first image directory only). */
export function readTiffHeader(bytes: Uint8Array): ImageHeader {
  const s = readStructure(bytes, false, Number.POSITIVE_INFINITY);
  return { format: 'tiff', widthPx: s.width, heightPx: s.height, bitDepth: s.bitDepth, channels: s.spp };
}

/** TIFF LZW (TIFF 6.0 section 13): MSB-first codes, 9–12 bits, early change. Returns bytes written. */
function lzwDecode(src: Uint8Array, off: number, len: number, out: Uint8Array): number {
  const prefix = new Int32Array(4096);
  const suffix = new Uint8Array(4096);
  const first = new Uint8Array(4096);
  const length = new Int32Array(4096);
  for (let i = 0; i < 256; i++) {
    prefix[i] = -1;
    suffix[i] = i;
    first[i] = i;
    length[i] = 1;
  }
  const end = off + len;
  let bitPos = off * 8;
  const endBit = end * 8;
  let width = 9;
  let next = 258;
  let old = -1;
  let o = 0;
  const cap = out.length;
  const write = (code: number): void => {
    const l = length[code];
    let p = o + l - 1;
    let c = code;
    while (c >= 0) {
      if (p < cap) out[p] = suffix[c];
      p--;
      c = prefix[c];
    }
    o += l;
  };
  while (bitPos + width <= endBit) {
    const byte = bitPos >>> 3;
    const w3 = (src[byte] << 16) | ((byte + 1 < end ? src[byte + 1] : 0) << 8) | (byte + 2 < end ? src[byte + 2] : 0);
    const code = (w3 >>> (24 - (bitPos & 7) - width)) & ((1 << width) - 1);
    bitPos += width;
    if (code === 257) break; // EOI
    if (code === 256) {
      width = 9;
      next = 258;
      old = -1;
      continue;
    }
    if (old < 0) {
      if (code > 255) fail('CORRUPT_IMAGE', 'the TIFF LZW data is damaged (bad first code)');
      write(code);
      old = code;
      continue;
    }
    if (code < next) {
      write(code);
      if (next < 4096) {
        prefix[next] = old;
        suffix[next] = first[code];
        first[next] = first[old];
        length[next] = length[old] + 1;
        next++;
      }
    } else if (code === next && next < 4096) {
      prefix[next] = old;
      suffix[next] = first[old];
      first[next] = first[old];
      length[next] = length[old] + 1;
      next++;
      write(code);
    } else {
      fail('CORRUPT_IMAGE', 'the TIFF LZW data is damaged (code out of range)');
    }
    old = code;
    if (next + 1 >= 1 << width && width < 12) width++;
    if (o >= cap) break;
  }
  return o;
}

/** PackBits (TIFF 6.0 section 9). Returns bytes written. */
function packBitsDecode(src: Uint8Array, off: number, len: number, out: Uint8Array): number {
  const end = off + len;
  const cap = out.length;
  let o = 0;
  while (off < end && o < cap) {
    const n = (src[off++] << 24) >> 24;
    if (n >= 0) {
      for (let i = 0; i <= n && off < end; i++) {
        if (o < cap) out[o] = src[off];
        o++;
        off++;
      }
    } else if (n !== -128) {
      const v = src[off++];
      for (let i = 0; i < 1 - n; i++) {
        if (o < cap) out[o] = v;
        o++;
      }
    }
  }
  return o;
}

function inflate(src: Uint8Array, off: number, len: number, out: Uint8Array): void {
  if (len < 6) fail('CORRUPT_IMAGE', 'the TIFF Deflate data is too short');
  // utif2 inflates `src.buffer` from off+2 (skipping the zlib header) through its bundled pako
  guard('TIFF Deflate', () => UTIF.decode._decompress({ isLE: true }, [], src, off, len, 8, out, 0, 1, 0, 0));
}

/** Decode one strip or tile into `out` (its nominal size); returns the number of bytes produced. */
function decodeChunk(src: Uint8Array, off: number, len: number, cmpr: number, out: Uint8Array): number {
  switch (cmpr) {
    case 1:
      out.set(src.subarray(off, off + Math.min(len, out.length)));
      return len;
    case 5:
      return lzwDecode(src, off, len, out);
    case 8:
    case 32946:
      inflate(src, off, len, out);
      return out.length;
    case 32773:
      return packBitsDecode(src, off, len, out);
    default:
      return fail('UNSUPPORTED_IMAGE', `TIFF compression ${cmpr} is not supported`);
  }
}

/** Undo byte order (to native little-endian pairs) and horizontal differencing, row by row. */
function postProcess(buf: Uint8Array, rows: number, rowBytes: number, bps: number, spp: number, le: boolean, predictor: number): void {
  if (bps === 16 && !le) {
    for (let i = 0; i + 1 < rows * rowBytes; i += 2) {
      const t = buf[i];
      buf[i] = buf[i + 1];
      buf[i + 1] = t;
    }
  }
  if (predictor !== 2) return;
  for (let y = 0; y < rows; y++) {
    const r = y * rowBytes;
    if (bps === 8) {
      for (let j = spp; j < rowBytes; j++) buf[r + j] = (buf[r + j] + buf[r + j - spp]) & 255;
    } else {
      const step = spp * 2;
      for (let j = step; j + 1 < rowBytes; j += 2) {
        const v = (buf[r + j] | (buf[r + j + 1] << 8)) + (buf[r + j - step] | (buf[r + j - step + 1] << 8));
        buf[r + j] = v & 255;
        buf[r + j + 1] = (v >> 8) & 255;
      }
    }
  }
}

/** Internal: full TIFF decode of the first page (call through decodeImage). */
export function decodeTiffImage(input: Uint8Array, maxPixels: number): DecodedImage {
  const s = readStructure(input, true, maxPixels);
  const { ifd, width, height, spp } = s;
  const bps = ifd.tags.get(258) ?? [1];
  const bitDepth = bps[0];
  if (bps.some((b) => b !== bitDepth)) fail('UNSUPPORTED_IMAGE', 'TIFF images with different bit depths per channel are not supported');
  const sampleFormat = one(ifd, 339, 1)!;
  if (sampleFormat === 3) fail('UNSUPPORTED_IMAGE', `${bitDepth}-bit floating-point TIFF is not supported; export as 8- or 16-bit integer`);
  if (sampleFormat !== 1) fail('UNSUPPORTED_IMAGE', 'TIFF with signed or undefined sample format is not supported; export as unsigned 8- or 16-bit');
  if (bitDepth !== 1 && bitDepth !== 8 && bitDepth !== 16) fail('UNSUPPORTED_IMAGE', `${bitDepth}-bit TIFF is not supported (only 1, 8 and 16 bits per sample)`);
  const cmpr = one(ifd, 259, 1)!;
  const compression = COMPRESSION_NAMES[cmpr];
  if (!compression) {
    const what = cmpr === 6 || cmpr === 7 ? 'JPEG-compressed' : `compression ${cmpr}`;
    fail('UNSUPPORTED_IMAGE', `TIFF ${what} is not supported (only none, LZW, Deflate, PackBits)`);
  }
  const photometric = one(ifd, 262, spp >= 3 ? 2 : 1)!;
  const predictor = one(ifd, 317, 1)!;
  if (predictor !== 1 && predictor !== 2) fail('UNSUPPORTED_IMAGE', `TIFF predictor ${predictor} is not supported`);
  if (predictor === 2 && bitDepth === 1) fail('CORRUPT_IMAGE', 'the TIFF uses a predictor on 1-bit data');
  if (spp > 1 && one(ifd, 284, 1) !== 1) fail('UNSUPPORTED_IMAGE', 'TIFF with separate colour planes (planar configuration 2) is not supported');
  if (one(ifd, 266, 1) !== 1) fail('UNSUPPORTED_IMAGE', 'TIFF with reversed bit fill order is not supported');
  let colorType: string;
  let colour = false;
  if (photometric === 0 || photometric === 1) {
    colorType = spp > 1 ? 'gray+alpha' : 'gray';
  } else if (photometric === 2) {
    if (spp < 3) fail('CORRUPT_IMAGE', 'the RGB TIFF has fewer than 3 samples per pixel');
    colorType = spp > 3 ? 'rgba' : 'rgb';
    colour = true;
  } else if (photometric === 3) {
    colorType = 'palette';
    if (bitDepth === 16 && spp === 1) {
      // fine
    } else if (bitDepth !== 8 || spp !== 1) fail('UNSUPPORTED_IMAGE', 'only 8- and 16-bit palette TIFF is supported');
  } else {
    const names: Record<number, string> = { 4: 'transparency mask', 5: 'CMYK', 6: 'YCbCr', 8: 'CIE Lab', 32844: 'LogL', 32845: 'LogLuv' };
    fail('UNSUPPORTED_IMAGE', `${names[photometric] ?? `photometric ${photometric}`} TIFF is not supported; save the image as gray or RGB`);
  }
  if (bitDepth === 1 && (spp !== 1 || photometric > 1)) fail('UNSUPPORTED_IMAGE', 'only 1-bit bilevel gray TIFF is supported');

  const bytes = input.byteOffset === 0 && input.byteLength === input.buffer.byteLength ? input : input.slice();
  const bytesPerPixel = (bitDepth * spp) / 8;
  const rowBytes = Math.ceil((width * spp * bitDepth) / 8);
  const pixelBytes = new Uint8Array(rowBytes * height);
  const tiled = ifd.tags.has(322);
  const offsets = ifd.tags.get(tiled ? 324 : 273);
  let counts = ifd.tags.get(tiled ? 325 : 279);
  if (!offsets || offsets.length === 0) fail('CORRUPT_IMAGE', 'the TIFF image directory has no strip or tile offsets');
  const tileW = tiled ? one(ifd, 322, 0)! : width;
  const tileH = tiled ? one(ifd, 323, 0)! : Math.min(one(ifd, 278, height)!, height);
  if (!(tileW > 0) || !(tileH > 0)) fail('CORRUPT_IMAGE', 'the TIFF tile or strip size is 0');
  if (tiled && bitDepth === 1) fail('UNSUPPORTED_IMAGE', '1-bit tiled TIFF is not supported');
  const across = Math.ceil(width / tileW);
  const down = Math.ceil(height / tileH);
  const nChunks = across * down;
  if (offsets.length < nChunks) fail('CORRUPT_IMAGE', `the TIFF lists ${offsets.length} strips or tiles where ${nChunks} are needed`);
  const chunkRowBytes = tiled ? tileW * bytesPerPixel : rowBytes;
  if (!counts) {
    if (cmpr !== 1) fail('CORRUPT_IMAGE', 'the TIFF image directory has no strip or tile byte counts');
    counts = offsets.map(() => chunkRowBytes * tileH);
  }
  if (counts.length < nChunks) fail('CORRUPT_IMAGE', 'the TIFF lists fewer byte counts than strips or tiles');
  for (let i = 0; i < nChunks; i++) {
    if (offsets[i] + counts[i] > bytes.length) {
      fail('TRUNCATED_IMAGE', 'the TIFF file is cut short (image data lies past its end)');
    }
  }
  const chunk = new Uint8Array(chunkRowBytes * tileH);
  const le = s.r.le;
  for (let ty = 0; ty < down; ty++) {
    for (let tx = 0; tx < across; tx++) {
      const i = ty * across + tx;
      const rows = tiled ? tileH : Math.min(tileH, height - ty * tileH);
      chunk.fill(0);
      const need = rows * chunkRowBytes;
      const got = decodeChunk(bytes, offsets[i], counts[i], cmpr, chunk);
      if (got < need) {
        fail(cmpr === 1 ? 'TRUNCATED_IMAGE' : 'CORRUPT_IMAGE', `a TIFF ${tiled ? 'tile' : 'strip'} holds less data than its size needs`);
      }
      postProcess(chunk, rows, chunkRowBytes, bitDepth, spp, le, predictor);
      if (!tiled) {
        pixelBytes.set(chunk.subarray(0, need), ty * tileH * rowBytes);
      } else {
        const x0 = tx * tileW;
        const copyBytes = Math.min(tileW, width - x0) * bytesPerPixel;
        const yEnd = Math.min(tileH, height - ty * tileH);
        for (let y = 0; y < yEnd; y++) {
          const dst = (ty * tileH + y) * rowBytes + x0 * bytesPerPixel;
          pixelBytes.set(chunk.subarray(y * chunkRowBytes, y * chunkRowBytes + copyBytes), dst);
        }
      }
    }
  }
  const raster = toRaster(pixelBytes, width, height, spp, bitDepth, rowBytes, photometric, colour, ifd);
  const meta = metadataScaleFromTiff({ xResolution: one(ifd, 282), yResolution: one(ifd, 283), resolutionUnit: one(ifd, 296) });
  return {
    format: 'tiff',
    widthPx: width,
    heightPx: height,
    bitDepth,
    channels: photometric === 3 ? 3 : spp,
    colorType,
    pageCount: s.pageCount,
    compression,
    raster,
    metadataScale: meta.scale,
    ...(meta.note !== undefined ? { metadataNote: meta.note } : {}),
  };
}

function toRaster(
  px: Uint8Array,
  width: number,
  height: number,
  spp: number,
  bitDepth: number,
  rowBytes: number,
  photometric: number,
  colour: boolean,
  ifd: Ifd,
): GrayRaster {
  let raster: GrayRaster;
  if (bitDepth === 1) {
    const out = new Float32Array(width * height);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) out[y * width + x] = (px[y * rowBytes + (x >> 3)] >> (7 - (x & 7))) & 1;
    }
    raster = createRaster(width, height, out);
  } else if (photometric === 3) {
    const map = ifd.tags.get(320);
    const n = 1 << bitDepth;
    if (!map || map.length < 3 * n) fail('CORRUPT_IMAGE', 'the palette TIFF has no complete colour map');
    const [wr, wg, wb] = LUMA_WEIGHTS_REC709;
    const lut = new Float32Array(n);
    for (let i = 0; i < n; i++) lut[i] = (wr * map[i] + wg * map[n + i] + wb * map[2 * n + i]) / 65535;
    const out = new Float32Array(width * height);
    for (let i = 0; i < out.length; i++) out[i] = lut[bitDepth === 8 ? px[i] : px[2 * i] | (px[2 * i + 1] << 8)];
    raster = createRaster(width, height, out);
  } else if (bitDepth === 8) {
    raster = samplesToRaster(px, width, height, spp, colour, 255, rowBytes);
  } else {
    // little-endian pairs after postProcess, assembled by hand (host byte order does not matter)
    const samples = new Uint16Array(px.length >> 1);
    for (let i = 0, j = 0; i < samples.length; i++, j += 2) samples[i] = px[j] | (px[j + 1] << 8);
    raster = samplesToRaster(samples, width, height, spp, colour, 65535, rowBytes >> 1);
  }
  if (photometric === 0) {
    const d = raster.data;
    for (let i = 0; i < d.length; i++) d[i] = 1 - d[i];
  }
  return raster;
}
