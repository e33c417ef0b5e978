/** Refused input: every failure is a FractozoneError with a stable code and a one-line message. */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isFractozoneError } from '../../../src/core/errors.js';
import { decodeImage, readImageHeader } from '../../../src/core/decode/index.js';
import { concatBytes, pngChunk as chunk } from '../../helpers/pngBytes.js';

const DIR = new URL('../../fixtures/decode/', import.meta.url);
const load = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(name, DIR)));

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    expect(isFractozoneError(e), `not a FractozoneError: ${String(e)}`).toBe(true);
    const msg = (e as Error).message;
    expect(msg).not.toMatch(/\n/);
    expect(msg.length).toBeGreaterThan(10);
    return (e as { code: string }).code;
  }
  return 'NO ERROR';
}

function pngWithHeader(w: number, h: number, rest: Uint8Array[] = []): Uint8Array {
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, w);
  dv.setUint32(4, h);
  ihdr.set([8, 0, 0, 0, 0], 8);
  return concatBytes([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), ...rest, chunk('IEND', new Uint8Array(0))]);
}
/** Little-endian classic TIFF with one IFD of SHORT/LONG tags and no pixel data. */
function tiffWithTags(tags: [number, number, number][]): Uint8Array {
  const out = new Uint8Array(8 + 2 + tags.length * 12 + 4);
  const dv = new DataView(out.buffer);
  out.set([0x49, 0x49, 42, 0]);
  dv.setUint32(4, 8, true);
  dv.setUint16(8, tags.length, true);
  tags.forEach(([tag, type, value], i) => {
    const e = 10 + i * 12;
    dv.setUint16(e, tag, true);
    dv.setUint16(e + 2, type, true);
    dv.setUint32(e + 4, 1, true);
    if (type === 3) dv.setUint16(e + 8, value, true);
    else dv.setUint32(e + 8, value, true);
  });
  return out;
}

describe('decodeImage refuses bad input with a clear code', () => {
  it('empty file → EMPTY_INPUT', () => {
    expect(codeOf(() => decodeImage(new Uint8Array(0)))).toBe('EMPTY_INPUT');
    expect(codeOf(() => readImageHeader(new Uint8Array(0)))).toBe('EMPTY_INPUT');
  });

  it('text, ZIP, PDF and tiny files → NOT_AN_IMAGE', () => {
    const enc = new TextEncoder();
    expect(codeOf(() => decodeImage(enc.encode('width,height\n24,16\n')))).toBe('NOT_AN_IMAGE');
    expect(codeOf(() => decodeImage(new Uint8Array([0x50, 0x4b, 3, 4, 20, 0, 0, 0, 8, 0])))).toBe('NOT_AN_IMAGE');
    expect(codeOf(() => decodeImage(enc.encode('%PDF-1.7\n%âãÏÓ\n')))).toBe('NOT_AN_IMAGE');
    expect(codeOf(() => decodeImage(new Uint8Array([1, 2, 3])))).toBe('NOT_AN_IMAGE');
  });

  it('0×0 and 0×16 PNG headers → ZERO_SIZE_IMAGE', () => {
    expect(codeOf(() => decodeImage(pngWithHeader(0, 0)))).toBe('ZERO_SIZE_IMAGE');
    expect(codeOf(() => decodeImage(pngWithHeader(0, 16)))).toBe('ZERO_SIZE_IMAGE');
    expect(codeOf(() => readImageHeader(pngWithHeader(0, 0)))).toBe('ZERO_SIZE_IMAGE');
    expect(codeOf(() => decodeImage(tiffWithTags([[256, 3, 0], [257, 3, 16]])))).toBe('ZERO_SIZE_IMAGE');
  });

  it('PNG and TIFF headers claiming 100000×100000 px → IMAGE_TOO_LARGE before any pixel decode', () => {
    // no image data follows the headers: reaching a pixel decoder would give CORRUPT/TRUNCATED instead
    const png = pngWithHeader(100_000, 100_000);
    const tif = tiffWithTags([[256, 4, 100_000], [257, 4, 100_000], [258, 3, 8], [273, 4, 0], [279, 4, 0]]);
    const heapBefore = process.memoryUsage().heapUsed;
    const t0 = performance.now();
    expect(codeOf(() => decodeImage(png))).toBe('IMAGE_TOO_LARGE');
    expect(codeOf(() => decodeImage(tif))).toBe('IMAGE_TOO_LARGE');
    expect(performance.now() - t0).toBeLessThan(1000);
    expect(process.memoryUsage().heapUsed - heapBefore).toBeLessThan(50e6); // a 1e10-pixel buffer was never made
    // header read still reports the claimed size
    expect(readImageHeader(png).widthPx).toBe(100_000);
  });

  it('maxPixels is honoured for real images (24×16 = 384 px)', () => {
    expect(codeOf(() => decodeImage(load('png_rgb8.png'), { maxPixels: 383 }))).toBe('IMAGE_TOO_LARGE');
    expect(codeOf(() => decodeImage(load('jpeg_rgb_baseline.jpg'), { maxPixels: 383 }))).toBe('IMAGE_TOO_LARGE');
    expect(codeOf(() => decodeImage(load('tiff_rgb8_lzw.tif'), { maxPixels: 383 }))).toBe('IMAGE_TOO_LARGE');
    expect(decodeImage(load('png_rgb8.png'), { maxPixels: 384 }).widthPx).toBe(24);
    expect(codeOf(() => decodeImage(load('png_rgb8.png'), { maxPixels: 0 }))).toBe('BAD_PARAMETER');
  });

  const truncations: [string, number[]][] = [
    ['png_rgb8.png', [0.2, 0.5, 0.9, -1]],
    ['png_gray16.png', [0.5, -4]],
    ['jpeg_rgb_baseline.jpg', [0.1, 0.5, 0.9, -2]],
    ['jpeg_rgb_progressive.jpg', [0.3, 0.7, -2]],
    ['tiff_gray8_none.tif', [0.5, 0.95]],
    ['tiff_rgb16_lzw.tif', [0.3, 0.6]],
    ['tiff_rgb8_deflate.tif', [0.5]],
    ['tiff_gray16_tiled.tif', [0.5]],
  ];
  for (const [name, cuts] of truncations) {
    it(`${name} cut short → TRUNCATED_IMAGE`, () => {
      const full = load(name);
      for (const c of cuts) {
        const n = c < 0 ? full.length + c : Math.floor(full.length * c);
        expect(codeOf(() => decodeImage(full.slice(0, n))), `${name} cut to ${n} of ${full.length} bytes`).toBe('TRUNCATED_IMAGE');
      }
    });
  }

  it('a flipped byte inside PNG image data fails its CRC → CORRUPT_IMAGE', () => {
    const b = load('png_rgb8.png');
    // find the IDAT chunk and flip a byte in its middle
    let off = 8;
    while (String.fromCharCode(...b.subarray(off + 4, off + 8)) !== 'IDAT') off += 12 + new DataView(b.buffer).getUint32(off);
    const len = new DataView(b.buffer).getUint32(off);
    b[off + 8 + (len >> 1)] ^= 0xff;
    expect(codeOf(() => decodeImage(b))).toBe('CORRUPT_IMAGE');
  });

  it('garbage in the middle of a JPEG or TIFF never escapes as a library exception', () => {
    for (const name of ['jpeg_rgb_baseline.jpg', 'jpeg_gray_progressive.jpg', 'tiff_rgb8_lzw.tif', 'tiff_gray16_deflate.tif', 'tiff_rgb8_packbits.tif']) {
      const orig = load(name);
      for (let k = 0; k < 20; k++) {
        const b = orig.slice();
        // deterministic damage pattern (seeded LCG): overwrite 16 bytes somewhere in the second half
        let s = (k + 1) * 2654435761;
        const at = Math.floor(b.length / 2) + (k * 37) % Math.floor(b.length / 3);
        for (let i = 0; i < 16 && at + i < b.length; i++) {
          s = (s * 1103515245 + 12345) >>> 0;
          b[at + i] = s >>> 24;
        }
        try {
          const img = decodeImage(b);
          expect(img.raster.data.length).toBe(img.widthPx * img.heightPx); // damage went unnoticed: still well-formed
        } catch (e) {
          expect(isFractozoneError(e), `${name} #${k}: ${String(e)}`).toBe(true);
        }
      }
    }
  });

  it('an LZW strip of endless non-clear codes terminates with CORRUPT_IMAGE', () => {
    const b = load('tiff_gray8_lzw.tif');
    const img = decodeImage(b);
    expect(img.compression).toBe('lzw');
    // overwrite the first strip with 0xFF bytes (9-bit code 511 > next code 258 → out of range)
    const dv = new DataView(b.buffer);
    const le = b[0] === 0x49;
    const n = dv.getUint16(dv.getUint32(4, le), le);
    let stripOff = -1;
    for (let k = 0; k < n; k++) {
      const e = dv.getUint32(4, le) + 2 + k * 12;
      if (dv.getUint16(e, le) === 273) {
        const type = dv.getUint16(e + 2, le);
        const cnt = dv.getUint32(e + 4, le);
        const ptr = cnt === 1 ? e + 8 : dv.getUint32(e + 8, le);
        stripOff = type === 3 ? dv.getUint16(ptr, le) : dv.getUint32(ptr, le);
      }
    }
    expect(stripOff).toBeGreaterThan(0);
    b.fill(0xff, stripOff, stripOff + 8);
    expect(codeOf(() => decodeImage(b))).toBe('CORRUPT_IMAGE');
  });

  it('unsupported kinds → UNSUPPORTED_IMAGE', () => {
    expect(codeOf(() => decodeImage(load('tiff_float16.tif')))).toBe('UNSUPPORTED_IMAGE');
    expect(codeOf(() => decodeImage(load('tiff_float32_nan.tif')))).toBe('UNSUPPORTED_IMAGE');
    // CMYK TIFF (photometric 5), signed 16-bit samples (SampleFormat 2), old-style JPEG (compression 6)
    const cmyk = tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 8], [262, 3, 5], [273, 4, 8], [277, 3, 4], [279, 4, 64]]);
    expect(codeOf(() => decodeImage(cmyk))).toBe('UNSUPPORTED_IMAGE');
    const signed = tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 16], [273, 4, 8], [279, 4, 32], [339, 3, 2]]);
    expect(codeOf(() => decodeImage(signed))).toBe('UNSUPPORTED_IMAGE');
    const ojpeg = tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 8], [259, 3, 6], [273, 4, 8], [279, 4, 32]]);
    expect(codeOf(() => decodeImage(ojpeg))).toBe('UNSUPPORTED_IMAGE');
  });

  it('BigTIFF headers are checked like classic ones', () => {
    // first directory past the end; an offset size other than 8
    expect(codeOf(() => decodeImage(new Uint8Array([0x49, 0x49, 0x2b, 0, 8, 0, 0, 0, 16, 0, 0, 0, 0, 0, 0, 0])))).toBe('TRUNCATED_IMAGE');
    expect(codeOf(() => decodeImage(new Uint8Array([0x49, 0x49, 0x2b, 0, 4, 0, 0, 0, 16, 0, 0, 0, 0, 0, 0, 0])))).toBe('CORRUPT_IMAGE');
    // an offset beyond 2^53 (high word set) cannot lie in the file
    expect(codeOf(() => decodeImage(new Uint8Array([0x49, 0x49, 0x2b, 0, 8, 0, 0, 0, 16, 0, 0, 0, 0, 0, 0, 0xff])))).toBe('TRUNCATED_IMAGE');
    const b = load('tiff_bigtiff_gray16.tif');
    expect(codeOf(() => decodeImage(b.slice(0, b.length - 10)))).toBe('TRUNCATED_IMAGE');
  });

  it('damaged TIFF structure values found by fuzzing give a code, never a RangeError', () => {
    // ImageLength as a RATIONAL 3/2 (a fraction), 0 and 65535 samples per pixel, 64-bit float × 16 samples beyond the budget
    const frac = tiffWithTags([[256, 3, 4], [257, 5, 40], [258, 3, 8], [273, 4, 8], [279, 4, 16]]);
    new DataView(frac.buffer).setUint32(40, 0x03000000, true); // the rational's bytes point into the header: any value, not whole
    expect(codeOf(() => decodeImage(frac))).toBe('CORRUPT_IMAGE');
    expect(codeOf(() => decodeImage(tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 8], [273, 4, 8], [277, 3, 0], [279, 4, 16]])))).toBe('CORRUPT_IMAGE');
    expect(codeOf(() => decodeImage(tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 8], [273, 4, 8], [277, 3, 65535], [279, 4, 16]])))).toBe('UNSUPPORTED_IMAGE');
    const big = tiffWithTags([[256, 4, 10000], [257, 4, 10000], [258, 3, 64], [273, 4, 8], [277, 3, 16], [279, 4, 16], [339, 3, 3]]);
    expect(codeOf(() => decodeImage(big))).toBe('IMAGE_TOO_LARGE');
  });

  it('a tile size out of proportion to the image is refused before allocating (was a RangeError)', () => {
    // 4×4 image claiming 4,000,000 × 4,000 px tiles
    const t = tiffWithTags([[256, 3, 4], [257, 3, 4], [258, 3, 8], [322, 4, 4_000_000], [323, 4, 4000], [324, 4, 8], [325, 4, 16]]);
    expect(codeOf(() => decodeImage(t))).toBe('CORRUPT_IMAGE');
  });

  it('a TIFF whose directories point at each other → CORRUPT_IMAGE, no hang', () => {
    const t = tiffWithTags([[256, 3, 1], [257, 3, 1]]);
    new DataView(t.buffer).setUint32(t.length - 4, 8, true); // next IFD = first IFD
    expect(codeOf(() => decodeImage(t))).toBe('CORRUPT_IMAGE');
  });
});
