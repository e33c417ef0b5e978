/**
 * encodePng with a shell's zlib compressor (the CLI's overlays: Node's zlib at level 1): a valid
 * PNG holding the same pixels, layout and pHYs as fast-png's file, read back by fast-png (the
 * JavaScript decoder) and by our decoder.
 */
import * as zlib from 'node:zlib';
import { decode } from 'fast-png';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/decode/index.js';
import { encodePng, type PngLayout } from '../../../src/core/encode/index.js';

const deflate = (raw: Uint8Array): Uint8Array => zlib.deflateSync(raw, { level: 1 });

function pixels(layout: PngLayout, w: number, h: number): Uint8Array | Uint16Array {
  const n = w * h * { gray8: 1, gray16: 1, rgb8: 3, rgba8: 4 }[layout];
  const a = layout === 'gray16' ? new Uint16Array(n) : new Uint8Array(n);
  for (let i = 0; i < n; i++) a[i] = layout === 'gray16' ? (i * 2654435761) >>> 16 : (i * 37 + (i >> 5)) & 0xff;
  return a;
}

describe('encodePng with a given zlib compressor', () => {
  for (const layout of ['gray8', 'gray16', 'rgb8', 'rgba8'] as PngLayout[]) {
    it(`${layout}: same pixels and pHYs as the fast-png file`, () => {
      const img = { width: 29, height: 11, data: pixels(layout, 29, 11), layout };
      const opts = { physUmPerPx: 2.5, physUmPerPxY: 3 };
      const ref = encodePng(img, opts);
      const fast = encodePng(img, { ...opts, deflate });
      expect(Buffer.from(fast).equals(Buffer.from(ref))).toBe(false); // other compressed bytes…
      const a = decode(ref, { checkCrc: true });
      const b = decode(fast, { checkCrc: true }); // …a valid PNG (CRCs checked)
      expect(b.width).toBe(29);
      expect([b.channels, b.depth, b.resolution]).toEqual([a.channels, a.depth, a.resolution]);
      expect(Array.from(b.data)).toEqual(Array.from(img.data));
      expect(decodeImage(fast)).toEqual(decodeImage(ref));
    });
  }
});
