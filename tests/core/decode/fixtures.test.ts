/**
 * Decoding of every fixture in tests/fixtures/decode/ against references computed outside our code by
 * scripts/fixtures/make_decode_fixtures.py (numpy from the written samples, each file first read back
 * with PIL 9.4 / tifffile 2023.2 / ImageMagick 6.9 to confirm the written samples; JPEG: PIL's libjpeg
 * decode, plus libjpeg via ImageMagick without fancy upsampling).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeImage, readImageHeader, sniffFormat } from '../../../src/core/decode/index.js';

const DIR = new URL('../../fixtures/decode/', import.meta.url);
const load = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(name, DIR)));

interface Entry {
  format: 'png' | 'jpeg' | 'tiff';
  widthPx: number;
  heightPx: number;
  bitDepth: number;
  channels: number;
  meanGray: number;
  samples: [number, number, number][];
  samplesPlainUpsampling?: [number, number, number][];
  colorType?: string;
  compression?: string;
  pageCount?: number;
  scale?: { umPerPxX: number; umPerPxY: number; source: string } | null;
  refuse?: string;
  /** JPEG-in-TIFF: compared with the JPEG tolerances */
  lossy?: boolean;
  /** floating-point TIFF: the stored range that was mapped to 0..1 */
  floatRange?: [number, number];
}
const expected = JSON.parse(readFileSync(new URL('expected.json', DIR), 'utf8')) as { files: Record<string, Entry> };
const entries = Object.entries(expected.files);

function mean(a: Float32Array): number {
  let s = 0;
  for (const v of a) s += v;
  return s / a.length;
}

describe('decodeImage on the reference fixtures', () => {
  it('has a reasonable number of fixtures (generator ran)', () => {
    expect(entries.length).toBeGreaterThanOrEqual(60);
  });

  for (const [name, e] of entries) {
    if (e.refuse) {
      it(`${name}: refused with ${e.refuse}`, () => {
        expect(() => decodeImage(load(name))).toThrowError(expect.objectContaining({ code: e.refuse }));
      });
      continue;
    }
    it(`${name}: size, depth, channels and gray values match the reference${e.lossy ? ' (JPEG tolerances)' : ''}`, () => {
      const bytes = load(name);
      expect(sniffFormat(bytes)).toBe(e.format);
      const h = readImageHeader(bytes);
      expect([h.format, h.widthPx, h.heightPx, h.bitDepth, h.channels]).toEqual([e.format, e.widthPx, e.heightPx, e.bitDepth, e.channels]);
      const img = decodeImage(bytes);
      expect(img.format).toBe(e.format);
      expect([img.widthPx, img.heightPx, img.raster.width, img.raster.height]).toEqual([e.widthPx, e.heightPx, e.widthPx, e.heightPx]);
      expect(img.bitDepth).toBe(e.bitDepth);
      expect(img.channels).toBe(e.channels);
      if (e.colorType) expect(img.colorType).toBe(e.colorType);
      if (e.compression) expect(img.compression).toBe(e.compression);
      expect(img.pageCount).toBe(e.pageCount ?? 1);
      const d = img.raster.data;
      const W = img.widthPx;
      if (e.floatRange) {
        expect(img.sampleFormat).toBe('float');
        expect(img.floatRange!.minValue).toBeCloseTo(e.floatRange[0], 4);
        expect(img.floatRange!.maxValue).toBeCloseTo(e.floatRange[1], 4);
      }
      if (e.format !== 'jpeg' && !e.lossy) {
        // lossless: exact up to Float32 rounding of a value in 0..1 (≤ 6e-8), 1e-6 allowed
        for (const [x, y, v] of e.samples) expect(Math.abs(d[y * W + x] - v)).toBeLessThan(1e-6);
        expect(Math.abs(mean(d) - e.meanGray)).toBeLessThan(1e-6);
      } else if (!e.samplesPlainUpsampling || name.includes('444')) {
        // gray and 4:4:4 JPEG vs PIL (libjpeg): IDCT implementations differ by ±1-2 levels → 2.5/255
        for (const [x, y, v] of e.samples) expect(Math.abs(d[y * W + x] - v)).toBeLessThan(2.5 / 255);
        expect(Math.abs(mean(d) - e.meanGray)).toBeLessThan(1 / 255);
      } else {
        // 4:2:0 colour JPEG: vs libjpeg with plain chroma replication (ImageMagick, fancy upsampling
        // off) within 2.5/255; vs PIL's default fancy upsampling only the mean is close (the test
        // pattern's blue channel changes every pixel, so triangular vs. replicated chroma differ
        // locally by up to ~12 levels)
        for (const [x, y, v] of e.samplesPlainUpsampling) expect(Math.abs(d[y * W + x] - v)).toBeLessThan(2.5 / 255);
        for (const [x, y, v] of e.samples) expect(Math.abs(d[y * W + x] - v)).toBeLessThan(16 / 255);
        expect(Math.abs(mean(d) - e.meanGray)).toBeLessThan(1 / 255);
      }
      if (e.scale !== undefined) {
        if (e.scale === null) {
          expect(img.metadataScale).toBeNull();
          expect(img.metadataNote).toBeTruthy();
        } else {
          expect(img.metadataScale).not.toBeNull();
          expect(img.metadataScale!.source).toBe(e.scale.source);
          expect(img.metadataScale!.umPerPxX).toBeCloseTo(e.scale.umPerPxX, 9);
          expect(img.metadataScale!.umPerPxY).toBeCloseTo(e.scale.umPerPxY, 9);
        }
      }
    });
  }

  it('16-bit samples keep their low byte (not rounded through 8 bits)', () => {
    // the generator makes the low byte differ from the high byte; an 8-bit shortcut would round
    // every value to a multiple of 257/65535
    for (const name of ['png_gray16.png', 'tiff_gray16_none.tif', 'tiff_gray16_bigendian.tif', 'tiff_gray16_lzw.tif']) {
      const d = decodeImage(load(name)).raster.data;
      let off = 0;
      for (const v of d) {
        const q = Math.round(v * 65535);
        if (q % 257 !== 0) off++;
      }
      expect(off, name).toBeGreaterThan(d.length / 2);
    }
  });

  it('decodes only the first page of a multi-page TIFF', () => {
    const img = decodeImage(load('tiff_gray16_2pages.tif'));
    expect(img.pageCount).toBe(2);
    const first = decodeImage(load('tiff_gray16_none.tif'));
    expect(Array.from(img.raster.data)).toEqual(Array.from(first.raster.data));
  });
});
