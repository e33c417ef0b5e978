import { readFileSync } from 'node:fs';
import { decode as decodePngLib } from 'fast-png';
import jpeg from 'jpeg-js';
import * as UTIF from 'utif2';
import { describe, expect, it } from 'vitest';
import { encodeJpeg, encodePng, encodeTiff, toUint16 } from '../../../src/core/encode/index.js';
import { createRaster } from '../../../src/core/image/raster.js';
import { FIXTURE_H, FIXTURE_W, gray16Pattern, gray8Pattern, rgb8Pattern } from './patterns.js';

const fx = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`../../fixtures/encode/${name}`, import.meta.url)));
const readback = JSON.parse(readFileSync(new URL('../../fixtures/encode/python-readback.json', import.meta.url), 'utf8')) as {
  files: Record<string, { samples: number[]; dpi?: number[]; tags?: Record<string, unknown>; progressive?: boolean; mode?: string }>;
};
const W = FIXTURE_W;
const H = FIXTURE_H;

describe('encoders reproduce the committed fixtures byte for byte', () => {
  const cases: [string, () => Uint8Array][] = [
    ['gray8.png', () => encodePng({ width: W, height: H, data: gray8Pattern(), layout: 'gray8' }, { physUmPerPx: 4 })],
    ['gray16.png', () => encodePng({ width: W, height: H, data: gray16Pattern(), layout: 'gray16' }, { physUmPerPx: 2.5, physUmPerPxY: 5 })],
    ['rgb8.png', () => encodePng({ width: W, height: H, data: rgb8Pattern(), layout: 'rgb8' })],
    ['gray16.tif', () => encodeTiff({ width: W, height: H, data: gray16Pattern(), samplesPerPixel: 1, umPerPxX: 4, umPerPxY: 5 })],
    ['gray8.tif', () => encodeTiff({ width: W, height: H, data: gray8Pattern(), samplesPerPixel: 1 })],
    ['rgb8.tif', () => encodeTiff({ width: W, height: H, data: rgb8Pattern(), samplesPerPixel: 3, umPerPxX: 0.5 })],
    ['gray8-q95.jpg', () => encodeJpeg({ width: W, height: H, data: gray8Pattern(), channels: 1 }, 95)],
  ];
  for (const [name, make] of cases) {
    it(name, () => {
      expect(Buffer.from(make()).equals(Buffer.from(fx(name)))).toBe(true);
    });
  }
});

// The fixtures were read back once by Debian's Pillow 9.4 / tifffile 2023.2 via
// scripts/fixtures/verify_encode.py; these checks compare that outside reading with the patterns.
describe('Pillow / tifffile read our files as intended (python-readback.json)', () => {
  it('lossless files decode to the exact samples', () => {
    expect(readback.files['gray8.png'].samples).toEqual(Array.from(gray8Pattern()));
    expect(readback.files['gray16.png'].samples).toEqual(Array.from(gray16Pattern()));
    expect(readback.files['rgb8.png'].samples).toEqual(Array.from(rgb8Pattern()));
    expect(readback.files['gray16.tif'].samples).toEqual(Array.from(gray16Pattern()));
    expect(readback.files['gray8.tif'].samples).toEqual(Array.from(gray8Pattern()));
    expect(readback.files['rgb8.tif'].samples).toEqual(Array.from(rgb8Pattern()));
  });
  it('pHYs: Pillow reports dpi = px per metre × 0.0254', () => {
    // 4 µm/px → 250000 px/m → 6350 dpi (PNG spec §11.3.5.3; 1 inch = 0.0254 m)
    expect(readback.files['gray8.png'].dpi).toEqual([6350, 6350]);
    expect(readback.files['gray16.png'].dpi).toEqual([10160, 5080]);
    expect(readback.files['rgb8.png'].dpi).toBeUndefined();
  });
  it('TIFF resolution in px per cm with ResolutionUnit 3', () => {
    const t = readback.files['gray16.tif'].tags!;
    expect(t.ResolutionUnit).toBe(3);
    const [xn, xd] = t.XResolution as number[];
    const [yn, yd] = t.YResolution as number[];
    expect(xn / xd).toBeCloseTo(1e4 / 4, 9);
    expect(yn / yd).toBeCloseTo(1e4 / 5, 9);
    expect(readback.files['gray8.tif'].tags!.ResolutionUnit).toBeUndefined();
  });
  it('JPEG is baseline and close to the input at quality 95', () => {
    expect(readback.files['gray8-q95.jpg'].progressive).toBe(false);
    const s = readback.files['gray8-q95.jpg'].samples;
    const ref = gray8Pattern();
    // the pattern wraps at 256 (sharp edges), so use the mean error (common practice, no source)
    let sum = 0;
    for (let i = 0; i < s.length; i++) {
      sum += Math.abs(s[i] - ref[i]);
    }
    expect(sum / s.length).toBeLessThan(12);
  });
});

describe('round trips through the libraries in node_modules', () => {
  it('fast-png decodes gray16 with pHYs resolution', () => {
    const d = decodePngLib(encodePng({ width: W, height: H, data: gray16Pattern(), layout: 'gray16' }, { physUmPerPx: 4 }));
    expect(d.depth).toBe(16);
    expect(Array.from(d.data)).toEqual(Array.from(gray16Pattern()));
    expect(d.resolution).toEqual({ x: 250000, y: 250000, unit: 1 });
  });
  it('fast-png decodes rgba8', () => {
    const rgba = new Uint8Array(W * H * 4).map((_, i) => (i * 31) % 256);
    const d = decodePngLib(encodePng({ width: W, height: H, data: rgba, layout: 'rgba8' }));
    expect(d.channels).toBe(4);
    expect(Array.from(d.data)).toEqual(Array.from(rgba));
  });
  it('utif2 decodes 16-bit TIFF samples and resolution tags', () => {
    const bytes = encodeTiff({ width: W, height: H, data: gray16Pattern(), samplesPerPixel: 1, umPerPxX: 2 });
    const ifds = UTIF.decode(bytes.buffer as ArrayBuffer);
    UTIF.decodeImage(bytes.buffer as ArrayBuffer, ifds[0]);
    const ifd = ifds[0];
    expect(ifd.width).toBe(W);
    const u16 = new Uint16Array(ifd.data.buffer, ifd.data.byteOffset, W * H);
    expect(Array.from(u16)).toEqual(Array.from(gray16Pattern()));
    const [num, den] = (ifd.t282 as unknown as number[][])[0];
    expect(num / den).toBeCloseTo(1e4 / 2, 6); // 2 µm/px → 5000 px/cm
    expect((ifd.t296 as number[])[0]).toBe(3);
  });
  it('multi-strip TIFF (tall image) round-trips', () => {
    const w = 300;
    const h = 250; // 300·2 B per row → 109 rows per strip → 3 strips
    const data = new Uint16Array(w * h).map((_, i) => (i * 37) % 65536);
    const bytes = encodeTiff({ width: w, height: h, data, samplesPerPixel: 1 });
    const ifds = UTIF.decode(bytes.buffer as ArrayBuffer);
    expect((ifds[0].t273 as number[]).length).toBe(3);
    UTIF.decodeImage(bytes.buffer as ArrayBuffer, ifds[0]);
    expect(Array.from(new Uint16Array(ifds[0].data.buffer, ifds[0].data.byteOffset, w * h))).toEqual(Array.from(data));
  });
  it('jpeg-js decodes our JPEG to nearly the input (smooth ramp)', () => {
    const w = 32;
    const h = 16;
    const g = new Uint8Array(w * h).map((_, i) => 40 + (i % w) * 5);
    const d = jpeg.decode(encodeJpeg({ width: w, height: h, data: g, channels: 1 }, 92), { useTArray: true });
    let maxErr = 0;
    for (let i = 0; i < w * h; i++) maxErr = Math.max(maxErr, Math.abs(d.data[4 * i] - g[i]));
    expect(maxErr).toBeLessThanOrEqual(4);
  });
  it('is deterministic and quantises 16-bit correctly', () => {
    const r = createRaster(3, 1, new Float32Array([0, 0.5, 1]));
    expect(Array.from(toUint16(r))).toEqual([0, 32768, 65535]);
    const a = encodeJpeg({ width: W, height: H, data: gray8Pattern(), channels: 1 }, 80);
    const b = encodeJpeg({ width: W, height: H, data: gray8Pattern(), channels: 1 }, 80);
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
  });
  it('refuses bad input with FractozoneError', () => {
    expect(() => encodePng({ width: W, height: H, data: new Uint8Array(5), layout: 'gray8' })).toThrow(/expected 117 samples/);
    expect(() => encodePng({ width: W, height: H, data: gray8Pattern(), layout: 'gray16' })).toThrow(/Uint16Array/);
    expect(() => encodeJpeg({ width: W, height: H, data: gray8Pattern(), channels: 1 }, 0)).toThrow(/quality/);
    expect(() => encodeTiff({ width: W, height: H, data: gray8Pattern(), samplesPerPixel: 1, umPerPxX: -1 })).toThrow(/pixel size/);
  });
});
