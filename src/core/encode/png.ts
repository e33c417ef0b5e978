/**
 * PNG encoder adapter (fast-png). Gray 8/16-bit, RGB 8-bit, RGBA 8-bit; optional pHYs chunk
 * (PNG 1.2 / ISO/IEC 15948 §11.3.5.3: pixels per unit, unit 1 = metre), px per metre = 1e6 / (µm/px).
 * fast-png does not write pHYs, so the chunk is spliced in right after IHDR (allowed position:
 * before the first IDAT, ISO/IEC 15948 §5.6) with its CRC-32 (ISO 3309 / ITU-T V.42 polynomial).
 */
import { encode } from 'fast-png';
import { FractozoneError } from '../errors.js';

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
  const png = encode({ width: img.width, height: img.height, data, depth: sixteen ? 16 : 8, channels: ch });
  return resolution ? insertPhys(png, resolution.x, resolution.y) : png;
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
