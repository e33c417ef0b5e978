/**
 * Decoding with Node's zlib (core/zlib.ts hook, set by the CLI) against the JavaScript path: TIFF
 * Deflate strips and tiles (utif2's pako otherwise) on every Deflate TIFF fixture, and PNG (fast-png
 * otherwise): the same raster byte for byte and the same description, on every PNG fixture
 * (1/2/4/8/16-bit, gray, gray+alpha, RGB, RGBA, palette with tRNS, pHYs; the interlaced one falls
 * back to fast-png), on generated files that use each of the five filter types with 1 to 8 bytes
 * per pixel and several IDAT chunks, and on damaged files (same error code and message).
 */
import { readdirSync, readFileSync } from 'node:fs';
import * as zlib from 'node:zlib';
import { afterEach, describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/decode/index.js';
import { crc32 } from '../../../src/core/encode/png.js';
import { setZlib, type NativeZlib } from '../../../src/core/zlib.js';
import { concatBytes as concat, pngChunk as chunk } from '../../helpers/pngBytes.js';

const DIR = new URL('../../fixtures/decode/', import.meta.url);
const pngFixtures = readdirSync(DIR).filter((n) => n.endsWith('.png'));
const deflateTiffs = readdirSync(DIR).filter((n) => n.endsWith('.tif') && n.includes('deflate'));

/** Node's zlib as the CLI hands it over, counting the inflates that went through it. */
function nodeZlib(): NativeZlib & { inflates: number } {
  const z = {
    inflates: 0,
    inflate(data: Uint8Array, maxLength: number): Uint8Array {
      const b = zlib.inflateSync(data, { maxOutputLength: Math.max(1, maxLength) });
      z.inflates++;
      return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
    },
    crc32: (data: Uint8Array) => crc32(data),
  };
  return z;
}

afterEach(() => setZlib(undefined));

/** Decodes `bytes` both ways; returns both results (or both errors) and the native inflate count. */
function both(bytes: Uint8Array): { js: unknown; native: unknown; inflates: number } {
  const run = (): unknown => {
    try {
      return decodeImage(bytes);
    } catch (e) {
      return { code: (e as { code?: string }).code, message: (e as Error).message };
    }
  };
  setZlib(undefined);
  const js = run();
  const z = nodeZlib();
  setZlib(z);
  const native = run();
  setZlib(undefined);
  return { js, native, inflates: z.inflates };
}


/**
 * A PNG whose row y uses filter type `filters[y % filters.length]` (forward filters of PNG spec.
 * §9.2, written here independently of both decoders), its zlib stream split into IDAT chunks of
 * `idatSize` bytes.
 */
function filteredPng(w: number, h: number, depth: 8 | 16, colorType: 0 | 2 | 4 | 6, filters: number[], idatSize: number, seed: number): Uint8Array {
  const spp = { 0: 1, 2: 3, 4: 2, 6: 4 }[colorType];
  const bpp = (spp * depth) / 8;
  const rowBytes = w * bpp;
  const raw = new Uint8Array(h * rowBytes);
  let s = seed >>> 0;
  for (let i = 0; i < raw.length; i++) {
    // smooth ramps plus noise: every filter sees varied predictions
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    raw[i] = ((i % rowBytes) * 3 + Math.floor(i / rowBytes) * 5 + (s >>> 28)) & 0xff;
  }
  const filtered = new Uint8Array(h * (rowBytes + 1));
  const at = (y: number, x: number): number => (y < 0 || x < 0 ? 0 : raw[y * rowBytes + x]);
  for (let y = 0; y < h; y++) {
    const f = filters[y % filters.length];
    filtered[y * (rowBytes + 1)] = f;
    for (let x = 0; x < rowBytes; x++) {
      const a = at(y, x - bpp);
      const b = at(y - 1, x);
      const c = at(y - 1, x - bpp);
      const p = a + b - c;
      const pr = Math.abs(p - a) <= Math.abs(p - b) && Math.abs(p - a) <= Math.abs(p - c) ? a : Math.abs(p - b) <= Math.abs(p - c) ? b : c;
      const pred = [0, a, b, (a + b) >> 1, pr][f];
      filtered[y * (rowBytes + 1) + 1 + x] = (raw[y * rowBytes + x] - pred) & 0xff;
    }
  }
  const z = zlib.deflateSync(filtered);
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, w);
  dv.setUint32(4, h);
  ihdr.set([depth, colorType, 0, 0, 0], 8);
  const idats: Uint8Array[] = [];
  for (let o = 0; o < z.length; o += idatSize) idats.push(chunk('IDAT', z.subarray(o, o + idatSize)));
  return concat([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), ...idats, chunk('IEND', new Uint8Array(0))]);
}

describe('PNG decode with native zlib = fast-png path, byte for byte', () => {
  it('has the PNG fixtures', () => {
    expect(pngFixtures.length).toBeGreaterThanOrEqual(15);
  });

  for (const name of pngFixtures) {
    it(`${name}: same raster and description`, () => {
      const { js, native, inflates } = both(new Uint8Array(readFileSync(new URL(name, DIR))));
      expect(native).toEqual(js);
      const r = (native as { raster?: { data: Float32Array } }).raster;
      expect(r?.data).toBeInstanceOf(Float32Array);
      expect(Buffer.from(r!.data.buffer).equals(Buffer.from((js as { raster: { data: Float32Array } }).raster.data.buffer))).toBe(true);
      // the interlaced fixture is left to fast-png; every other one went through the native path
      expect(inflates).toBe(name.includes('interlaced') ? 0 : 1);
    });
  }

  const cases: [string, 8 | 16, 0 | 2 | 4 | 6][] = [
    ['gray 8-bit', 8, 0],
    ['gray+alpha 8-bit', 8, 4],
    ['RGB 8-bit', 8, 2],
    ['RGBA 8-bit', 8, 6],
    ['gray 16-bit', 16, 0],
    ['RGB 16-bit', 16, 2],
    ['RGBA 16-bit', 16, 6],
  ];
  for (const [what, depth, ct] of cases) {
    it(`${what}: all five filter types, several IDAT chunks`, () => {
      const bytes = filteredPng(37, 23, depth, ct, [0, 1, 2, 3, 4, 4, 3, 2, 1], 97, depth * 10 + ct);
      const { js, native, inflates } = both(bytes);
      expect(inflates).toBe(1);
      expect((js as { raster?: unknown }).raster).toBeDefined();
      expect(native).toEqual(js);
    });
  }

  it('damaged files: same error code and message (bad CRC, truncated stream, unknown filter type)', () => {
    const good = filteredPng(16, 8, 8, 0, [1, 2, 3, 4], 1 << 16, 7);
    const badCrc = good.slice();
    badCrc[33 + 8 + 5] ^= 0xff; // a byte of the first IDAT's data
    // a zlib stream cut short, CRC recomputed
    const z = zlib.deflateSync(new Uint8Array(8 * 17));
    const ihdr = good.subarray(8, 33);
    const cut = concat([good.subarray(0, 8), ihdr, chunk('IDAT', z.subarray(0, z.length - 6)), chunk('IEND', new Uint8Array(0))]);
    // filter type 9 on the first row
    const raw = new Uint8Array(8 * 17);
    raw[0] = 9;
    const badFilter = concat([good.subarray(0, 8), ihdr, chunk('IDAT', zlib.deflateSync(raw)), chunk('IEND', new Uint8Array(0))]);
    for (const bytes of [badCrc, cut, badFilter]) {
      const { js, native } = both(bytes);
      expect((js as { code?: string }).code).toBe('CORRUPT_IMAGE');
      expect(native).toEqual(js);
    }
  });
});

describe('TIFF Deflate with native zlib = utif2/pako path, byte for byte', () => {
  it('has Deflate TIFF fixtures', () => {
    expect(deflateTiffs.length).toBeGreaterThanOrEqual(8);
  });
  for (const name of deflateTiffs) {
    it(`${name}: same raster and description, strips inflated natively`, () => {
      const { js, native, inflates } = both(new Uint8Array(readFileSync(new URL(name, DIR))));
      expect((js as { raster?: unknown }).raster).toBeDefined();
      expect(native).toEqual(js);
      expect(inflates).toBeGreaterThan(0);
    });
  }
});
