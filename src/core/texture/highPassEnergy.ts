/**
 * High-pass energy: squared deviation from the local mean, pointwise or box-averaged.
 */
import { createRaster, type GrayRaster } from '../image/raster.js';
import { boxMeanInto } from './boxMean.js';
import type { FeatureDefinition } from './types.js';
import { DEFAULT_WINDOW_RULE } from './window.js';
import { checkRaster, checkWindowFits, nonFinite } from './validate.js';

/**
 * Pointwise high-pass energy p = (I − boxMean_w(I))², box mean with window `windowPx` and
 * reflect-101 border (OpenCV `BORDER_REFLECT_101` = SciPy mode `'mirror'`).
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side of the local mean in px, 3 ≤ windowPx ≤ min(width, height)
 * @returns p per pixel, unit (gray level)²
 */
export function highPassEnergyPointwise(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  return createRaster(r.width, r.height, pointwise(r, windowPx));
}

/**
 * High-pass energy feature: box mean (same window, reflect-101) of the pointwise high-pass
 * energy (I − boxMean_w(I))² (see {@link highPassEnergyPointwise}). A box average of a pointwise
 * quantity, hence linear in the area fraction of two textures inside the outer window (the inner
 * local mean makes it exact only where both textures are locally homogeneous).
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side in px (inner and outer), 3 ≤ windowPx ≤ min(width, height)
 * @returns mean p per pixel, unit (gray level)²
 */
export function highPassEnergy(r: GrayRaster, windowPx: number): GrayRaster {
  checkRaster(r);
  checkWindowFits(windowPx, r.width, r.height);
  const p = pointwise(r, windowPx);
  const out = new Float32Array(p.length);
  boxMeanInto(p, r.width, r.height, windowPx, out);
  return createRaster(r.width, r.height, out);
}

function pointwise(r: GrayRaster, windowPx: number): Float32Array {
  const m = new Float32Array(r.data.length);
  boxMeanInto(r.data, r.width, r.height, windowPx, m);
  const d = r.data;
  let bad = 0;
  for (let i = 0; i < d.length; i++) {
    const v = d[i] - m[i];
    m[i] = v * v;
    bad += v;
  }
  if (!Number.isFinite(bad)) nonFinite();
  return m;
}

/** Registry entry: high-pass energy. */
export const highPassEnergyFeature: FeatureDefinition = {
  name: 'highPassEnergy',
  unit: 'gray level² (0..1)',
  description: 'window mean of the squared deviation from the local mean',
  linearInAreaFraction: true,
  transform: 'log',
  gainPower: 2,
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) => highPassEnergy(r, o.windowPx),
};
