/**
 * Local darkness: the reciprocal of the local mean gray level. Not a roughness measure but the
 * tone cue that goes with roughness under a light from high above (a ring light or coaxial light
 * on a stereo microscope): the smooth, nearly flat rim sends the light back into the objective,
 * the rough core's tilted facets send it aside and shade each other, so the core looks darker
 * while its shading texture fades (the shading term of a facet goes with the cosine of the
 * light's elevation; common practice of bright-field macro photography, no source). The
 * classification takes log(1/mean) = −log(mean): a darker window scores higher, as a rougher one
 * does for the roughness features.
 */
import { createRaster, type GrayRaster } from '../image/raster.js';
import { boxMean } from './boxMean.js';
import type { FeatureDefinition } from './types.js';
import { DEFAULT_WINDOW_RULE } from './window.js';

/** Mean gray levels below this are taken as this (a black window would give an infinite darkness). */
export const DARKNESS_FLOOR = 1e-3;

/**
 * 1 / max(mean, {@link DARKNESS_FLOOR}) over the square window of odd side `windowPx` (box mean,
 * reflect-101 borders, texture/boxMean.ts).
 *
 * @param r gray raster (0..1)
 * @param windowPx odd window side in px
 * @returns darkness per pixel, 1 / gray level (1 for white, 1000 at the floor)
 */
export function localDarkness(r: GrayRaster, windowPx: number): GrayRaster {
  const m = boxMean(r, windowPx).data;
  const out = new Float32Array(m.length);
  for (let i = 0; i < m.length; i++) out[i] = 1 / Math.max(DARKNESS_FLOOR, m[i]);
  return createRaster(r.width, r.height, out);
}

/** Registry entry: local darkness (the tone cue; refined on the mean brightness, segment/refine.ts 'box'). */
export const localDarknessFeature: FeatureDefinition = {
  name: 'localDarkness',
  unit: '1 / gray level',
  description: 'reciprocal of the mean gray level in the window: the tone cue for a light from high above (rim bright, core dark)',
  linearInAreaFraction: false,
  transform: 'log',
  // 1 / (k·mean) = darkness / k; the classification leaves tone features unnormalised (pipeline/stages/classify.ts)
  gainPower: -1,
  cue: 'tone',
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) => localDarkness(r, o.windowPx),
};
