/**
 * Local variance and local standard deviation of gray levels (roughness as contrast).
 */
import { createRaster, type GrayRaster } from '../image/raster.js';
import { boxMomentsKernel, Moment } from './kernels/boxMomentsKernel.js';
import type { FeatureDefinition } from './types.js';
import { DEFAULT_WINDOW_RULE } from './window.js';
import { checkRaster, checkWindowFits, nonFinite } from './validate.js';

/**
 * Local variance Var = max(0, E[x²] − E[x]²) over the square window of odd side `windowPx`.
 *
 * E[·] is the box mean, computed by a fused one-pass running-sum kernel in double precision
 * (kernels/boxMomentsKernel.ts; measured faster here than two opencv-wasm `boxFilter` calls).
 * Border: reflect-101 (OpenCV `BORDER_REFLECT_101` = SciPy `ndimage` mode `'mirror'`). Equivalent to SciPy
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
  const { width, height, data } = r;
  const out = new Float32Array(width * height);
  // the kernel reports non-finite input (saves a separate pass over the image)
  if (!boxMomentsKernel(data, width, height, (windowPx - 1) / 2, sqrt ? Moment.Std : Moment.Variance, out)) nonFinite();
  return out;
}

/** Registry entry: local standard deviation. */
export const localStdFeature: FeatureDefinition = {
  name: 'localStd',
  unit: 'gray level (0..1)',
  description: 'standard deviation of the gray levels in the window',
  linearInAreaFraction: false,
  transform: 'log',
  gainPower: 1,
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) => localStd(r, o.windowPx),
};

/** Registry entry: local variance. */
export const localVarianceFeature: FeatureDefinition = {
  name: 'localVariance',
  unit: 'gray level² (0..1)',
  description: 'variance of the gray levels in the window',
  linearInAreaFraction: false,
  transform: 'log',
  gainPower: 2,
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) => localVariance(r, o.windowPx),
};
