/**
 * TIFF compressions (TIFF 6.0): LZW (section 13), PackBits (section 9) and Deflate (TIFF
 * Technical Note 2 / Adobe Photoshop TIFF; zlib stream), and JPEG (TIFF Technical Note 2,
 * "new-style" compression 7: each strip or tile a JPEG stream, its tables optionally in
 * JPEGTables). LZW and PackBits are our own bounded loops (utif2's LZW can loop for ever on a
 * corrupt code stream); Deflate goes through utif2's bundled pako, JPEG through jpeg-js.
 */
import * as jpegNs from 'jpeg-js';
import * as utifNs from 'utif2';
import { fail, guard } from '../fail.js';
import { getZlib } from '../../zlib.js';

type Decompress = (
  img: { isLE: boolean },
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
const UTIF: UtifLike = (utifNs as unknown as { default?: UtifLike }).default ?? (utifNs as unknown as UtifLike);

type JpegDecodeFn = (
  data: Uint8Array,
  opts: { useTArray: true; formatAsRGBA: boolean; tolerantDecoding: boolean; colorTransform: boolean; maxResolutionInMP: number; maxMemoryUsageInMB: number },
) => { width: number; height: number; data: Uint8Array };
// jpeg-js is CommonJS: Node's ESM loader puts module.exports on `default`, bundlers may not.
const jpegDecode: JpegDecodeFn = ((jpegNs as unknown as { default?: { decode: JpegDecodeFn } }).default ?? (jpegNs as unknown as { decode: JpegDecodeFn })).decode;

export const COMPRESSION_NAMES: Record<number, string> = { 1: 'none', 5: 'lzw', 7: 'jpeg', 8: 'deflate', 32946: 'deflate', 32773: 'packbits' };

/** TIFF LZW (TIFF 6.0 section 13): MSB-first codes, 9–12 bits, early change. Returns bytes written. */
export function lzwDecode(src: Uint8Array, off: number, len: number, out: Uint8Array): number {
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
export function packBitsDecode(src: Uint8Array, off: number, len: number, out: Uint8Array): number {
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

export function inflate(src: Uint8Array, off: number, len: number, out: Uint8Array): void {
  if (len < 6) fail('CORRUPT_IMAGE', 'the TIFF Deflate data is too short');
  // With a shell's native zlib (core/zlib.ts): the same bytes where it inflates the stream whole
  // (header and Adler-32 checked, output no longer than the strip); anything else — a damaged or
  // cut stream, a longer output — goes the utif2/pako way below, as before.
  const z = getZlib();
  if (z) {
    let bin: Uint8Array | null = null;
    try {
      bin = z.inflate(src.subarray(off, off + len), out.length);
    } catch {
      bin = null;
    }
    if (bin) {
      out.set(bin);
      return;
    }
  }
  // utif2 inflates `src.buffer` from off+2 (skipping the zlib header) through its bundled pako
  guard('TIFF Deflate', () => UTIF.decode._decompress({ isLE: true }, [], src, off, len, 8, out, 0, 1, 0, 0));
}

/**
 * Decode one strip or tile into `out` (its nominal size).
 * @param jpeg - for compression 7: the stream's parameters
 * @returns the number of bytes produced
 */
export function decodeChunk(src: Uint8Array, off: number, len: number, cmpr: number, out: Uint8Array, jpeg: JpegChunk | null): number {
  switch (cmpr) {
    case 1:
      out.set(src.subarray(off, off + Math.min(len, out.length)));
      return len;
    case 5:
      return lzwDecode(src, off, len, out);
    case 7:
      return jpeg ? decodeJpegChunk(src, off, len, jpeg, out) : fail('UNSUPPORTED_IMAGE', 'this JPEG-compressed TIFF layout is not supported');
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

/** Parameters of a JPEG strip or tile (see {@link decodeJpegChunk}). */
export interface JpegChunk {
  /** JPEGTables (tag 347): SOI, DQT/DHT segments, EOI; empty when every stream is complete. */
  tables: Uint8Array;
  /** Expected width and height of the stream, px. */
  width: number;
  height: number;
  /** 1 (gray) or 3 (colour) samples per pixel. */
  spp: number;
  /** True for photometric YCbCr (colour-transformed JPEG), false for RGB or gray. */
  ycbcr: boolean;
}

/**
 * Decodes one JPEG strip or tile into interleaved 8-bit samples of `out` (its nominal size).
 * An abbreviated stream gets the tables spliced in front (SOI + tables without their SOI/EOI +
 * the stream without its SOI), which is what libtiff hands to libjpeg.
 * @returns bytes produced
 */
export function decodeJpegChunk(src: Uint8Array, off: number, len: number, p: JpegChunk, out: Uint8Array): number {
  let stream = src.subarray(off, off + len);
  if (stream.length < 4 || stream[0] !== 0xff || stream[1] !== 0xd8) fail('CORRUPT_IMAGE', 'a JPEG strip or tile of the TIFF does not start with a JPEG marker');
  const t = p.tables;
  if (t.length >= 4 && t[0] === 0xff && t[1] === 0xd8) {
    const body = t.subarray(2, t[t.length - 2] === 0xff && t[t.length - 1] === 0xd9 ? t.length - 2 : t.length);
    const joined = new Uint8Array(2 + body.length + stream.length - 2);
    joined.set([0xff, 0xd8]);
    joined.set(body, 2);
    joined.set(stream.subarray(2), 2 + body.length);
    stream = joined;
  }
  const img = guard('TIFF JPEG', () =>
    jpegDecode(stream, {
      useTArray: true,
      formatAsRGBA: false,
      tolerantDecoding: false,
      colorTransform: p.ycbcr,
      maxResolutionInMP: Math.max(1, Math.ceil((p.width * p.height) / 1e6)),
      maxMemoryUsageInMB: Math.max(64, Math.ceil((p.width * p.height * 16) / 1048576)),
    }),
  );
  if (img.width !== p.width || img.height < p.height) fail('CORRUPT_IMAGE', `a JPEG strip or tile of the TIFF is ${img.width}×${img.height} px where ${p.width}×${p.height} px are needed`);
  // jpeg-js gives 3 bytes per pixel (gray repeated): keep 1 or 3
  const n = p.width * p.height;
  if (p.spp === 3) out.set(img.data.subarray(0, Math.min(n * 3, out.length)));
  else for (let i = 0; i < n && i < out.length; i++) out[i] = img.data[i * 3];
  return n * p.spp;
}
