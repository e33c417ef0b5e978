/**
 * TIFF structure: header and image file directories of classic TIFF (TIFF Revision 6.0, Adobe
 * 1992, section 2) and BigTIFF (64-bit offsets: magic 43, 20-byte entries, 8-byte counts and
 * offsets; the BigTIFF proposal adopted by libtiff 4.0). Only the tags fractozone uses are read;
 * every offset and count is checked against the file length before it is followed, and the page
 * chain is walked with a loop check and a page limit.
 */
import { checkSize, fail } from '../fail.js';

/** TIFF field types → bytes per value (1 BYTE … 13 IFD; 16 LONG8, 17 SLONG8, 18 IFD8). */
const TYPE_SIZE = [0, 1, 1, 2, 4, 8, 1, 1, 2, 4, 8, 4, 8, 4, 0, 0, 8, 8, 8];
const MAX_PAGES = 100_000;
/** Tags read from the first directory. */
const WANTED = new Set([256, 257, 258, 259, 262, 266, 273, 277, 278, 279, 282, 283, 284, 296, 317, 320, 322, 323, 324, 325, 338, 339, 347, 530]);
/** Tags whose values may be fractions (X/YResolution). */
const FRACTION_TAGS = new Set([282, 283]);

export interface Ifd {
  tags: Map<number, number[]>;
  /** Raw bytes of UNDEFINED-type tags that are byte strings (JPEGTables). */
  next: number;
}

export class Reader {
  constructor(
    readonly b: Uint8Array,
    readonly le: boolean,
    readonly big: boolean,
  ) {}
  u16(o: number): number {
    const b = this.b;
    return this.le ? b[o] | (b[o + 1] << 8) : (b[o] << 8) | b[o + 1];
  }
  u32(o: number): number {
    const b = this.b;
    return this.le ? (b[o] | (b[o + 1] << 8) | (b[o + 2] << 16)) + b[o + 3] * 16777216 : b[o] * 16777216 + ((b[o + 1] << 16) | (b[o + 2] << 8) | b[o + 3]);
  }
  /** 64-bit unsigned as a number; values beyond 2^53 become Infinity (they lie past any file). */
  u64(o: number): number {
    const lo = this.u32(this.le ? o : o + 4);
    const hi = this.u32(this.le ? o + 4 : o);
    return hi >= 0x200000 ? Number.POSITIVE_INFINITY : hi * 4294967296 + lo;
  }
  /** Offset-sized value (4 bytes classic, 8 BigTIFF). */
  off(o: number): number {
    return this.big ? this.u64(o) : this.u32(o);
  }
  get offSize(): number {
    return this.big ? 8 : 4;
  }
  get entrySize(): number {
    return this.big ? 20 : 12;
  }
}

function readValue(r: Reader, type: number, p: number): number {
  switch (type) {
    case 1:
    case 2:
    case 6:
    case 7:
      return r.b[p];
    case 3:
    case 8:
      return r.u16(p);
    case 4:
    case 9:
    case 13:
      return r.u32(p);
    case 5:
    case 10: {
      const den = r.u32(p + 4);
      return den === 0 ? Number.NaN : r.u32(p) / den;
    }
    case 16:
    case 17:
    case 18:
      return r.u64(p);
    default:
      return Number.NaN; // FLOAT / DOUBLE: no tag we read uses them
  }
}

/** Reads one directory; with `readValues` false only its link to the next one. */
export function readIfd(r: Reader, off: number, readValues: boolean): Ifd {
  const n = r.b.length;
  const countSize = r.big ? 8 : 2;
  if (!(off + countSize <= n)) fail('TRUNCATED_IMAGE', 'the TIFF file is cut short (an image directory lies past its end)');
  const count = r.big ? r.u64(off) : r.u16(off);
  const end = off + countSize + count * r.entrySize;
  if (!(end + r.offSize <= n)) fail('TRUNCATED_IMAGE', 'the TIFF file is cut short inside an image directory');
  const tags = new Map<number, number[]>();
  for (let k = 0; readValues && k < count; k++) {
    const e = off + countSize + k * r.entrySize;
    const tag = r.u16(e);
    if (!WANTED.has(tag)) continue;
    const type = r.u16(e + 2);
    const cnt = r.big ? r.u64(e + 4) : r.u32(e + 4);
    const size = TYPE_SIZE[type] ?? 0;
    if (size === 0) fail('CORRUPT_IMAGE', `the TIFF tag ${tag} has an unknown field type ${type}`);
    if (cnt > 1 << 26) fail('CORRUPT_IMAGE', `the TIFF tag ${tag} has an impossible number of values`);
    const bytes = size * cnt;
    const inline = r.big ? 8 : 4;
    const vo = bytes <= inline ? e + (r.big ? 12 : 8) : r.off(e + (r.big ? 12 : 8));
    if (!(vo + bytes <= n)) fail('TRUNCATED_IMAGE', `the TIFF file is cut short (the values of tag ${tag} lie past its end)`);
    const vals = new Array<number>(cnt);
    for (let i = 0; i < cnt; i++) vals[i] = readValue(r, type, vo + i * size);
    // sizes, counts, offsets and codes are whole numbers: a fraction (RATIONAL type), NaN (FLOAT)
    // or a 64-bit value beyond 2^53 is damage, not something to round
    if (!FRACTION_TAGS.has(tag) && !vals.every(Number.isSafeInteger)) fail('CORRUPT_IMAGE', `the TIFF tag ${tag} holds a value that is not a whole number`);
    tags.set(tag, vals);
  }
  return { tags, next: r.off(end) };
}

export interface TiffStructure {
  r: Reader;
  ifd: Ifd;
  pageCount: number;
  width: number;
  height: number;
  bitDepth: number;
  spp: number;
}

/** First value of a tag, or the default. */
export function one(ifd: Ifd, tag: number, dflt?: number): number | undefined {
  const v = ifd.tags.get(tag);
  return v && v.length > 0 ? v[0] : dflt;
}

/** Header + first directory (+ the page count when asked). Checks the pixel budget. */
export function readStructure(bytes: Uint8Array, countPages: boolean, maxPixels: number): TiffStructure {
  if (bytes.length < 8) fail('TRUNCATED_IMAGE', 'the TIFF file ends inside its header');
  const le = bytes[0] === 0x49;
  const magic = le ? bytes[2] | (bytes[3] << 8) : (bytes[2] << 8) | bytes[3];
  if (magic !== 42 && magic !== 43) fail('NOT_AN_IMAGE', 'the file is not a TIFF image');
  const big = magic === 43;
  const r = new Reader(bytes, le, big);
  if (big) {
    if (bytes.length < 16) fail('TRUNCATED_IMAGE', 'the BigTIFF file ends inside its header');
    if (r.u16(4) !== 8 || r.u16(6) !== 0) fail('CORRUPT_IMAGE', 'the BigTIFF header gives an offset size other than 8 bytes');
  }
  const first = r.off(4 + (big ? 4 : 0));
  if (first < (big ? 16 : 8)) fail('CORRUPT_IMAGE', 'the TIFF header points to an impossible image directory');
  const ifd = readIfd(r, first, true);
  const width = one(ifd, 256, 0)!;
  const height = one(ifd, 257, 0)!;
  checkSize(big ? 'BigTIFF' : 'TIFF', width, height, maxPixels);
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
