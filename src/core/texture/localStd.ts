/**
 * Local variance and local standard deviation of gray levels (roughness as contrast).
 */
import { getCv } from '../cv.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { planStrips } from './kernels/strips.js';
import type { FeatureDefinition } from './types.js';
import { checkRaster, checkWindowFits, nonFinite } from './validate.js';

/**
 * Local variance Var = max(0, E[x²] − E[x]²) over the square window of odd side `windowPx`.
 *
 * E[·] is the box mean (OpenCV `boxFilter`, CV_32F, sums in double). Border: reflect-101
 * (OpenCV `BORDER_REFLECT_101` = SciPy `ndimage` mode `'mirror'`). To limit cancellation the
 * image mean is subtracted first (variance is shift invariant). Equivalent to SciPy
 * `uniform_filter(x², w, mode='mirror') − uniform_filter(x, w, mode='mirror')²`.
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side in px, 3 ≤ windowPx ≤ min(width, height)
 * @returns variance per pixel, unit (gray level)², gray 0..1
 * @see Gonzalez & Woods, Digital Image Processing, 4th ed., 2018, §3.3 (local statistics)
 */
export function localVariance(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  return createRaster(r.width, r.height, varianceData(r, windowPx, false));
}

/**
 * Local standard deviation sqrt(max(0, E[x²] − E[x]²)) over the square window of odd side
 * `windowPx`; see {@link localVariance} for the border rule.
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side in px, 3 ≤ windowPx ≤ min(width, height)
 * @returns standard deviation per pixel, unit gray level (0..1)
 */
export function localStd(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  return createRaster(r.width, r.height, varianceData(r, windowPx, true));
}

function varianceData(r: GrayRaster, windowPx: number, sqrt: boolean): Float32Array {
  const cv = getCv();
  const { width, height, data } = r;
  let mean = 0;
  for (let i = 0; i < data.length; i++) mean += data[i];
  mean /= data.length;
  if (!Number.isFinite(mean)) nonFinite();
  const shift = Math.fround(mean);
  const out = new Float32Array(width * height);
  const half = (windowPx - 1) / 2;
  const ksize = new cv.Size(windowPx, windowPx);
  const anchor = new cv.Point(-1, -1);
  for (const s of planStrips(width, height, half)) {
    const rows = s.h1 - s.h0;
    const n = rows * width;
    const x = new cv.Mat(rows, width, cv.CV_32F);
    const x2 = new cv.Mat(rows, width, cv.CV_32F);
    const m = new cv.Mat(rows, width, cv.CV_32F);
    const m2 = new cv.Mat(rows, width, cv.CV_32F);
    try {
      const xd: Float32Array = x.data32F;
      const x2d: Float32Array = x2.data32F;
      const off = s.h0 * width;
      for (let i = 0; i < n; i++) {
        const v = data[off + i] - shift;
        xd[i] = v;
        x2d[i] = v * v;
      }
      cv.boxFilter(x, m, -1, ksize, anchor, true, cv.BORDER_REFLECT_101);
      cv.boxFilter(x2, m2, -1, ksize, anchor, true, cv.BORDER_REFLECT_101);
      const md: Float32Array = m.data32F; // views taken after the last OpenCV call
      const m2d: Float32Array = m2.data32F;
      const i0 = (s.y0 - s.h0) * width;
      const i1 = (s.y1 - s.h0) * width;
      const o = s.y0 * width - i0;
      for (let i = i0; i < i1; i++) {
        const mu = md[i];
        const v = m2d[i] - mu * mu;
        out[o + i] = v > 0 ? (sqrt ? Math.sqrt(v) : v) : 0;
      }
    } finally {
      x.delete();
      x2.delete();
      m.delete();
      m2.delete();
    }
  }
  return out;
}

/** Registry entry: local standard deviation. */
export const localStdFeature: FeatureDefinition = {
  name: 'localStd',
  unit: 'gray level (0..1)',
  description: 'standard deviation of the gray levels in the window',
  linearInAreaFraction: false,
  compute: (r, o) => localStd(r, o.windowPx),
};

/** Registry entry: local variance. */
export const localVarianceFeature: FeatureDefinition = {
  name: 'localVariance',
  unit: 'gray level² (0..1)',
  description: 'variance of the gray levels in the window',
  linearInAreaFraction: false,
  compute: (r, o) => localVariance(r, o.windowPx),
};
