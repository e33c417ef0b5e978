/**
 * Gradient energy: squared Sobel gradient magnitude, pointwise or box-averaged.
 */
import { getCv } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { boxMeanInto } from './boxMean.js';
import { planStrips } from './kernels/strips.js';
import type { FeatureDefinition } from './types.js';
import { DEFAULT_WINDOW_RULE } from './window.js';
import { checkRaster, checkWindowFits, nonFinite } from './validate.js';

/**
 * Pointwise gradient energy g² = gx² + gy², with gx, gy the 3×3 Sobel responses (unnormalised
 * kernel [−1 0 1] ⊗ [1 2 1], as OpenCV `Sobel(ksize=3)` and SciPy `ndimage.sobel`; a unit ramp
 * of slope s per pixel gives gx = 8·s). Border: reflect-101 (OpenCV `BORDER_REFLECT_101` = SciPy
 * mode `'mirror'`).
 *
 * @param r gray raster (0..1), at least 2×2 px
 * @returns g² per pixel, unit (gray level)² (Sobel scale, see above)
 * @see Sobel & Feldman (1968), in Duda & Hart, Pattern Classification and Scene Analysis, 1973
 */
export function gradientEnergyPointwise(r: GrayRaster): GrayRaster {
  checkRaster(r);
  if (Math.min(r.width, r.height) < 2) {
    throw new FractozoneError('BAD_PARAMETER', `the image (${r.width}×${r.height} px) is too small for a gradient`);
  }
  const out = new Float32Array(r.width * r.height);
  sobelEnergyInto(r, out);
  return createRaster(r.width, r.height, out);
}

/**
 * Gradient energy feature: box mean (window `windowPx`, reflect-101) of the pointwise Sobel
 * energy gx² + gy² (see {@link gradientEnergyPointwise}). Being a box average of a pointwise
 * quantity, it is linear in the area fraction of two textures inside the window.
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side in px, 3 ≤ windowPx ≤ min(width, height)
 * @returns mean g² per pixel, unit (gray level)² (Sobel scale)
 */
export function gradientEnergy(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  const e = sobelEnergyOnce(r);
  const out = new Float32Array(r.width * r.height);
  boxMeanInto(e, r.width, r.height, windowPx, out);
  return createRaster(r.width, r.height, out);
}

/**
 * The pointwise energy of a raster, once per raster: it does not depend on the window, and the
 * parameter range (pipeline/stages/uncertainty.ts) computes the feature of the same working copy at
 * two more windows. Rasters are not changed in place, so the raster names its energy; only read.
 */
function sobelEnergyOnce(r: GrayRaster): Float32Array {
  const hit = ENERGY.get(r);
  if (hit) return hit;
  const e = new Float32Array(r.width * r.height);
  sobelEnergyInto(r, e);
  ENERGY.set(r, e);
  return e;
}
const ENERGY = new WeakMap<GrayRaster, Float32Array>();

function sobelEnergyInto(r: GrayRaster, out: Float32Array): void {
  const cv = getCv();
  const { width, data } = r;
  for (const s of planStrips(width, r.height, 1)) {
    const rows = s.h1 - s.h0;
    const a = new cv.Mat(rows, width, cv.CV_32F);
    const gx = new cv.Mat(rows, width, cv.CV_32F);
    const gy = new cv.Mat(rows, width, cv.CV_32F);
    try {
      (a.data32F as Float32Array).set(data.subarray(s.h0 * width, s.h1 * width));
      cv.Sobel(a, gx, cv.CV_32F, 1, 0, 3, 1, 0, cv.BORDER_REFLECT_101);
      cv.Sobel(a, gy, cv.CV_32F, 0, 1, 3, 1, 0, cv.BORDER_REFLECT_101);
      const gxd: Float32Array = gx.data32F; // views taken after the last OpenCV call
      const gyd: Float32Array = gy.data32F;
      const i0 = (s.y0 - s.h0) * width;
      const i1 = (s.y1 - s.h0) * width;
      const o = s.y0 * width - i0;
      let bad = 0;
      for (let i = i0; i < i1; i++) {
        const u = gxd[i];
        const v = gyd[i];
        const e = u * u + v * v;
        out[o + i] = e;
        bad += e;
      }
      if (!Number.isFinite(bad)) nonFinite();
    } finally {
      a.delete();
      gx.delete();
      gy.delete();
    }
  }
}

/** Registry entry: gradient energy. */
export const gradientEnergyFeature: FeatureDefinition = {
  name: 'gradientEnergy',
  unit: 'gray level² (Sobel scale)',
  description: 'window mean of the squared 3×3 Sobel gradient magnitude',
  linearInAreaFraction: true,
  transform: 'log',
  gainPower: 2,
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) => gradientEnergy(r, o.windowPx),
};
