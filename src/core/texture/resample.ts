/**
 * Area-averaging downsampling (OpenCV `resize` with `INTER_AREA`).
 */
import { getCv } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { checkRaster } from './validate.js';

/**
 * Downsamples by `factor` (full-resolution px per output px) with area averaging: each output
 * pixel is the area-weighted mean of the input pixels it covers (OpenCV `INTER_AREA`; for an
 * integer factor k it is the plain mean of k×k blocks). Output size round(width / factor) ×
 * round(height / factor), at least 1×1. Factor 1 returns `r` itself (no copy).
 *
 * @param r gray raster
 * @param factor ≥ 1
 * @returns downsampled raster, same units
 * @see OpenCV 4.3 `cv::resize`, `INTER_AREA`
 */
export function downsample(r: GrayRaster, factor: number): GrayRaster {
  checkRaster(r);
  if (!(Number.isFinite(factor) && factor >= 1)) {
    throw new FractozoneError('BAD_PARAMETER', `the downsampling factor must be a number ≥ 1, got ${factor}`);
  }
  if (factor === 1) return r;
  const w = Math.max(1, Math.round(r.width / factor));
  const h = Math.max(1, Math.round(r.height / factor));
  const cv = getCv();
  const src = new cv.Mat(r.height, r.width, cv.CV_32F);
  const dst = new cv.Mat();
  try {
    (src.data32F as Float32Array).set(r.data);
    cv.resize(src, dst, new cv.Size(w, h), 0, 0, cv.INTER_AREA);
    return createRaster(w, h, new Float32Array(dst.data32F as Float32Array));
  } finally {
    src.delete();
    dst.delete();
  }
}
