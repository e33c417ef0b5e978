/**
 * Box (moving-average) filter on a gray raster, via OpenCV `boxFilter` on CV_32F.
 */
import { getCv } from '../cv.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { planStrips } from './kernels/strips.js';
import { checkRaster, checkWindowFits, nonFinite } from './validate.js';

/**
 * Mean of `r` over the square window of odd side `windowPx` centred on each pixel.
 *
 * Border: reflect-101 (OpenCV `BORDER_REFLECT_101`, SciPy `ndimage` mode `'mirror'`:
 * … 2 1 | 0 1 2 … ). OpenCV accumulates float box sums in double precision.
 *
 * Use it to box-average a pointwise quantity at another window (the result is then linear in the
 * area fraction of two textures inside the window).
 *
 * @param r gray raster (any real values)
 * @param windowPx odd window side in px, 3 ≤ windowPx ≤ min(width, height)
 * @returns raster of the same size, same unit as `r`
 * @see OpenCV 4.3 `cv::boxFilter` (normalize = true)
 */
export function boxMean(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  if (!Number.isFinite(sum(r.data))) nonFinite();
  const out = new Float32Array(r.width * r.height);
  boxMeanInto(r.data, r.width, r.height, windowPx, out);
  return createRaster(r.width, r.height, out);
}

/**
 * Strip-wise box mean of `src` into `out` (no checks; windowPx already validated).
 * `src` and `out` must be different arrays (strips read rows the previous strip wrote).
 */
export function boxMeanInto(src: Float32Array, width: number, height: number, windowPx: number, out: Float32Array): void {
  const cv = getCv();
  const half = (windowPx - 1) / 2;
  const ksize = new cv.Size(windowPx, windowPx);
  const anchor = new cv.Point(-1, -1);
  for (const s of planStrips(width, height, half)) {
    const rows = s.h1 - s.h0;
    const a = new cv.Mat(rows, width, cv.CV_32F);
    const m = new cv.Mat(rows, width, cv.CV_32F);
    try {
      const ad: Float32Array = a.data32F;
      ad.set(src.subarray(s.h0 * width, s.h1 * width));
      cv.boxFilter(a, m, -1, ksize, anchor, true, cv.BORDER_REFLECT_101);
      const md: Float32Array = m.data32F; // view taken after the last OpenCV call (heap may grow)
      out.set(md.subarray((s.y0 - s.h0) * width, (s.y1 - s.h0) * width), s.y0 * width);
    } finally {
      a.delete();
      m.delete();
    }
  }
}

/** NaN/Inf probe: a NaN or Inf anywhere makes the sum non-finite. */
function sum(d: Float32Array): number {
  let s = 0;
  for (let i = 0; i < d.length; i++) s += d[i];
  return s;
}
