/**
 * Minimal baseline TIFF writer (TIFF 6.0, Adobe 1992): little-endian, uncompressed, chunky,
 * one strip per ~64 KiB, gray (1 sample) or RGB (3 samples), 8 or 16 bits per sample.
 * With a pixel size it writes XResolution / YResolution in pixels per centimetre
 * (ResolutionUnit = 3): px/cm = 1e4 / (µm/px).
 */
import { FractozoneError } from '../errors.js';
import { checkImageInput } from './png.js';

export interface TiffImageInput {
  readonly width: number;
  readonly height: number;
  /** samples, row-major, interleaved; Uint16Array → 16 bits per sample, Uint8Array → 8 */
  readonly data: Uint16Array | Uint8Array;
  readonly samplesPerPixel: 1 | 3;
  /** pixel width, µm/px (optional) */
  readonly umPerPxX?: number;
  /** pixel height, µm/px (default = umPerPxX) */
  readonly umPerPxY?: number;
  /** optional ImageDescription text (ASCII) */
  readonly description?: string;
}

/** Rational approximation p/q of a positive number for a TIFF RATIONAL (q = 10000 or smaller). */
function rational(v: number): [number, number] {
  let q = 10000;
  while (q > 1 && Math.round(v * q) > 0xffffffff) q /= 10;
  return [Math.round(v * q), q];
}

/**
 * Encode a TIFF (deterministic: same input → same bytes).
 * @returns TIFF file bytes
 */
export function encodeTiff(img: TiffImageInput): Uint8Array {
  const spp = img.samplesPerPixel;
  if (spp !== 1 && spp !== 3) throw new FractozoneError('BAD_PARAMETER', `TIFF samples per pixel must be 1 or 3, got ${String(spp)}`);
  checkImageInput(img.width, img.height, img.data, spp, 'TIFF');
  const bits = img.data instanceof Uint16Array ? 16 : 8;
  const bpp = (bits / 8) * spp;
  const rowBytes = img.width * bpp;
  const rowsPerStrip = Math.max(1, Math.floor(65536 / rowBytes));
  const nStrips = Math.ceil(img.height / rowsPerStrip);
  const umX = img.umPerPxX;
  const umY = img.umPerPxY ?? img.umPerPxX;
  if (umX !== undefined && (!(umX > 0) || !Number.isFinite(umX) || !(umY! > 0) || !Number.isFinite(umY!))) {
    throw new FractozoneError('BAD_PARAMETER', `TIFF pixel size must be a positive number of µm, got ${umX} × ${umY}`);
  }
  const desc = img.description !== undefined ? img.description.replace(/[^\x20-\x7e\n]/g, '?') + '\0' : null;

  type Entry = { tag: number; type: number; count: number; value: number[] | null; extra?: Uint8Array };
  const SHORT = 3;
  const LONG = 4;
  const RATIONAL = 5;
  const ASCII = 2;
  const entries: Entry[] = [];
  const add = (tag: number, type: number, values: number[]): void => {
    entries.push({ tag, type, count: type === RATIONAL ? values.length / 2 : values.length, value: values });
  };
  add(256, LONG, [img.width]);
  add(257, LONG, [img.height]);
  add(258, SHORT, new Array(spp).fill(bits));
  add(259, SHORT, [1]); // no compression
  add(262, SHORT, [spp === 1 ? 1 : 2]); // BlackIsZero / RGB
  if (desc) entries.push({ tag: 270, type: ASCII, count: desc.length, value: null, extra: Uint8Array.from(desc, (c) => c.charCodeAt(0)) });
  add(273, LONG, new Array(nStrips).fill(0)); // StripOffsets, patched below
  add(277, SHORT, [spp]);
  add(278, LONG, [rowsPerStrip]);
  const counts: number[] = [];
  for (let s = 0; s < nStrips; s++) counts.push(Math.min(rowsPerStrip, img.height - s * rowsPerStrip) * rowBytes);
  add(279, LONG, counts);
  if (umX !== undefined) {
    add(282, RATIONAL, rational(1e4 / umX));
    add(283, RATIONAL, rational(1e4 / umY!));
  }
  add(284, SHORT, [1]); // chunky
  if (umX !== undefined) add(296, SHORT, [3]); // centimetre
  entries.sort((a, b) => a.tag - b.tag);

  const typeSize = (t: number): number => (t === SHORT ? 2 : t === LONG ? 4 : t === RATIONAL ? 8 : 1);
  const ifdOffset = 8;
  const ifdSize = 2 + entries.length * 12 + 4;
  let extraOffset = ifdOffset + ifdSize;
  const extraPos = new Map<Entry, number>();
  for (const e of entries) {
    const size = e.count * typeSize(e.type);
    if (size > 4) {
      extraPos.set(e, extraOffset);
      extraOffset += size + (size & 1);
    }
  }
  const dataOffset = extraOffset;
  const strip = entries.find((e) => e.tag === 273)!;
  strip.value = counts.map((_, s) => dataOffset + s * rowsPerStrip * rowBytes);
  const total = dataOffset + img.height * rowBytes;
  const buf = new Uint8Array(total);
  const dv = new DataView(buf.buffer);
  buf[0] = 0x49;
  buf[1] = 0x49; // "II" little-endian
  dv.setUint16(2, 42, true);
  dv.setUint32(4, ifdOffset, true);
  dv.setUint16(ifdOffset, entries.length, true);
  const writeValues = (e: Entry, at: number): void => {
    if (e.extra) {
      buf.set(e.extra, at);
      return;
    }
    const v = e.value!;
    for (let i = 0; i < v.length; i++) {
      if (e.type === SHORT) dv.setUint16(at + 2 * i, v[i], true);
      else dv.setUint32(at + 4 * i, v[i], true);
    }
  };
  entries.forEach((e, k) => {
    const p = ifdOffset + 2 + 12 * k;
    dv.setUint16(p, e.tag, true);
    dv.setUint16(p + 2, e.type, true);
    dv.setUint32(p + 4, e.count, true);
    const at = extraPos.get(e);
    if (at !== undefined) {
      dv.setUint32(p + 8, at, true);
      writeValues(e, at);
    } else writeValues(e, p + 8);
  });
  dv.setUint32(ifdOffset + 2 + 12 * entries.length, 0, true); // no next IFD
  if (bits === 8) buf.set(img.data as Uint8Array, dataOffset);
  else {
    const d = img.data as Uint16Array;
    for (let i = 0; i < d.length; i++) dv.setUint16(dataOffset + 2 * i, d[i], true);
  }
  return buf;
}
