/**
 * The working copy smoothed with a Gaussian of σ = 1 px (OpenCV `GaussianBlur`, reflect-101), once per
 * raster: the silhouette's edge band (specimen.ts) and the intensity cue of the edge search (polar.ts)
 * both read it. Issue 16: the two used to blur the same 1200 × 900 copy each.
 */
import { getCv } from '../cv.js';
import type { GrayRaster } from '../image/raster.js';
import { rasterToMat } from './cvutil.js';
import { oncePerRaster } from './memo.js';

const SMOOTHED = new WeakMap<GrayRaster, Map<string, Float32Array>>();

/** `cv.GaussianBlur(r, σ = 1, BORDER_REFLECT_101)` of `r` (cached per raster: do not write to it). */
export function gaussian1(r: GrayRaster): Float32Array {
  return oncePerRaster(SMOOTHED, r, 'σ1', () => {
    const cv = getCv();
    const src = rasterToMat(r);
    const dst = new cv.Mat();
    try {
      cv.GaussianBlur(src, dst, new cv.Size(0, 0), 1, 1, cv.BORDER_REFLECT_101);
      return new Float32Array(dst.data32F as Float32Array);
    } finally {
      src.delete();
      dst.delete();
    }
  });
}
