/**
 * rectMorph (JS sliding-count square erosion/dilation) against OpenCV's own cv.erode / cv.dilate
 * with a MORPH_RECT kernel and the default border (outside reference: opencv-wasm 4.3).
 */
import { describe, expect, it } from 'vitest';
import { getCv } from '../../../src/core/cv.js';
import { rectMorph } from '../../../src/core/segment/cvutil.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function viaOpenCv(src: Uint8Array, w: number, h: number, r: number, op: 'erode' | 'dilate'): Uint8Array {
  const cv = getCv();
  const m = new cv.Mat(h, w, cv.CV_8U);
  const k = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(2 * r + 1, 2 * r + 1));
  try {
    (m.data as Uint8Array).set(src.map((v) => (v ? 255 : 0)));
    if (op === 'erode') cv.erode(m, m, k);
    else cv.dilate(m, m, k);
    return Uint8Array.from(m.data as Uint8Array, (v) => (v ? 1 : 0));
  } finally {
    m.delete();
    k.delete();
  }
}

describe('rectMorph', () => {
  for (const [w, h, r, density] of [
    [37, 23, 3, 0.5],
    [64, 40, 7, 0.93],
    [50, 50, 12, 0.08],
    [9, 31, 12, 0.7], // window larger than the image
  ] as const) {
    it(`equals cv.erode / cv.dilate (MORPH_RECT) on a random ${w}×${h} mask, r = ${r}`, () => {
      const rnd = lcg(w * 1000 + h * 10 + r);
      const src = new Uint8Array(w * h);
      // blobs rather than salt: random discs, so both operations change something
      for (let n = 0; n < 12; n++) {
        const cx = rnd() * w;
        const cy = rnd() * h;
        const rad = 1 + rnd() * Math.min(w, h) * 0.3;
        for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if ((x - cx) ** 2 + (y - cy) ** 2 < rad * rad) src[y * w + x] = 1;
      }
      for (let i = 0; i < src.length; i++) if (rnd() > density) src[i] = src[i] ? 0 : src[i];
      for (const op of ['erode', 'dilate'] as const) {
        const ours = rectMorph(src, w, h, r, op);
        const ref = viaOpenCv(src, w, h, r, op);
        expect(Array.from(ours), op).toEqual(Array.from(ref));
      }
    });
  }
});
