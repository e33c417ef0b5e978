/**
 * PNG encoder adapter (fast-png). Gray 8/16-bit, RGB 8-bit, RGBA 8-bit; optional pHYs chunk
 * (PNG 1.2 / ISO/IEC 15948 §11.3.5.3: pixels per unit, unit 1 = metre), px per metre = 1e6 / (µm/px).
 * fast-png does not write pHYs, so the chunk is spliced in right after IHDR (allowed position:
 * before the first IDAT, ISO/IEC 15948 §5.6) with its CRC-32 (ISO 3309 / ITU-T V.42 polynomial).
 */
import { encode } from 'fast-png';
import { FractozoneError } from '../errors.js';
import { getZlib } from '../zlib.js';

export type PngLayout = 'gray8' | 'gray16' | 'rgb8' | 'rgba8';

export interface PngImageInput {
  readonly width: number;
  readonly height: number;
  /** samples row-major, interleaved for rgb/rgba */
  readonly data: Uint8Array | Uint8ClampedArray | Uint16Array;
  readonly layout: PngLayout;
}

export interface PngEncodeOptions {
  /** pixel size in µm per px (x); writes pHYs when given */
  readonly physUmPerPx?: number;
  /** pixel height in µm per px (default = physUmPerPx) */
  readonly physUmPerPxY?: number;
  /**
   * A zlib (RFC 1950) compressor from the shell, e.g. Node's `zlib.deflateSync` at level 1 for the
   * overlays: the file then holds the same pixels in other compressed bytes. Without it fast-png
   * compresses (fflate, level 3).
   */
  readonly deflate?: (raw: Uint8Array) => Uint8Array;
}

const CHANNELS: Record<PngLayout, number> = { gray8: 1, gray16: 1, rgb8: 3, rgba8: 4 };

/** Checks dimensions, sample type and count; throws BAD_PARAMETER with one sentence. */
export function checkImageInput(width: number, height: number, data: ArrayLike<number>, channels: number, what: string): void {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new FractozoneError('BAD_PARAMETER', `${what}: image size must be positive whole numbers of pixels, got ${width}×${height}`);
  }
  if (data.length !== width * height * channels) {
    throw new FractozoneError('BAD_PARAMETER', `${what}: expected ${width * height * channels} samples for ${width}×${height}×${channels}, got ${data.length}`);
  }
}

/** Pixels per metre for a pixel size in µm, rounded to the nearest integer (pHYs stores uint32). */
export function pxPerMetre(umPerPx: number): number {
  if (!(umPerPx > 0) || !Number.isFinite(umPerPx)) throw new FractozoneError('BAD_PARAMETER', `pixel size must be a positive number of µm, got ${umPerPx}`);
  return Math.round(1e6 / umPerPx);
}

/**
 * Encode a PNG (deterministic: same input → same bytes).
 * @param img pixels and layout ('gray16' needs a Uint16Array, the others 8-bit arrays)
 * @param opts physUmPerPx (µm/px) adds a pHYs chunk in pixels per metre
 * @returns PNG file bytes
 */
export function encodePng(img: PngImageInput, opts: PngEncodeOptions = {}): Uint8Array {
  const ch = CHANNELS[img.layout];
  if (ch === undefined) throw new FractozoneError('BAD_PARAMETER', `unknown PNG layout "${String(img.layout)}" (use gray8, gray16, rgb8 or rgba8)`);
  checkImageInput(img.width, img.height, img.data, ch, 'PNG');
  const sixteen = img.layout === 'gray16';
  if (sixteen !== img.data instanceof Uint16Array) {
    throw new FractozoneError('BAD_PARAMETER', `PNG ${img.layout} needs ${sixteen ? 'a Uint16Array' : 'an 8-bit array'} of samples`);
  }
  const data = img.data instanceof Uint8ClampedArray ? new Uint8Array(img.data.buffer, img.data.byteOffset, img.data.length) : img.data;
  const resolution =
    opts.physUmPerPx !== undefined
      ? { x: pxPerMetre(opts.physUmPerPx), y: pxPerMetre(opts.physUmPerPxY ?? opts.physUmPerPx), unit: 1 as const }
      : undefined;
  const png = opts.deflate
    ? encodeWith(opts.deflate, img.width, img.height, data, sixteen, ch)
    : encode({ width: img.width, height: img.height, data, depth: sixteen ? 16 : 8, channels: ch });
  return resolution ? insertPhys(png, resolution.x, resolution.y) : png;
}

/** PNG colour type of a sample count (gray, gray+alpha unused, RGB, RGBA). */
const COLOUR_TYPE: Record<number, number> = { 1: 0, 3: 2, 4: 6 };

/**
 * The PNG fast-png writes (signature, IHDR, one IDAT of rows with filter type 0, IEND), the image
 * data compressed by the given zlib compressor. Written here because fast-png's encoder takes no
 * compressor; it also writes the rows byte by byte (≈ 50 ms for a 1600 × 1200 RGBA overlay, here
 * one copy per row).
 */
function encodeWith(deflate: (raw: Uint8Array) => Uint8Array, w: number, h: number, data: Uint8Array | Uint16Array, sixteen: boolean, ch: number): Uint8Array {
  const rowBytes = w * ch * (sixteen ? 2 : 1);
  const raw = new Uint8Array(h * (rowBytes + 1));
  for (let y = 0; y < h; y++) {
    const o = y * (rowBytes + 1) + 1; // filter type 0 (None) left at 0
    if (sixteen) {
      for (let i = 0, s = y * w * ch; i < w * ch; i++, s++) {
        raw[o + 2 * i] = data[s] >> 8;
        raw[o + 2 * i + 1] = data[s] & 0xff;
      }
    } else raw.set((data as Uint8Array).subarray(y * rowBytes, (y + 1) * rowBytes), o);
  }
  const z = deflate(raw);
  const out = new Uint8Array(8 + 25 + 12 + z.length + 12);
  const dv = new DataView(out.buffer);
  out.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], 0);
  const chunkAt = (o: number, type: string, len: number): void => {
    dv.setUint32(o, len);
    for (let i = 0; i < 4; i++) out[o + 4 + i] = type.charCodeAt(i);
  };
  chunkAt(8, 'IHDR', 13);
  dv.setUint32(16, w);
  dv.setUint32(20, h);
  out.set([sixteen ? 16 : 8, COLOUR_TYPE[ch], 0, 0, 0], 24);
  dv.setUint32(29, crc32(out, 12, 29));
  chunkAt(33, 'IDAT', z.length);
  out.set(z, 41);
  const native = getZlib(); // the shell's CRC when it gave one (the image data are megabytes)
  dv.setUint32(41 + z.length, native ? native.crc32(out.subarray(37, 41 + z.length)) : crc32(out, 37, 41 + z.length));
  const e = 45 + z.length;
  chunkAt(e, 'IEND', 0);
  dv.setUint32(e + 8, crc32(out, e + 4, e + 8));
  return out;
}

let crcTable: Uint32Array | null = null;
/** CRC-32 as used by PNG chunks (polynomial 0xEDB88320, reflected). */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = crcTable[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function insertPhys(png: Uint8Array, ppmX: number, ppmY: number): Uint8Array {
  const ihdrEnd = 8 + 4 + 4 + 13 + 4;
  const chunk = new Uint8Array(4 + 4 + 9 + 4);
  const dv = new DataView(chunk.buffer);
  dv.setUint32(0, 9);
  chunk.set([0x70, 0x48, 0x59, 0x73], 4); // "pHYs"
  dv.setUint32(8, ppmX);
  dv.setUint32(12, ppmY);
  chunk[16] = 1; // unit: metre
  dv.setUint32(17, crc32(chunk, 4, 17));
  const out = new Uint8Array(png.length + chunk.length);
  out.set(png.subarray(0, ihdrEnd), 0);
  out.set(chunk, ihdrEnd);
  out.set(png.subarray(ihdrEnd), ihdrEnd + chunk.length);
  return out;
}
