/**
 * Results computed once per working copy: the segmentation steps that several specimens of one image
 * (both halves) ask for again. Rasters are not changed in place in core, so a raster and a key
 * (the options) name the result; callers must not write to what they get.
 */
import type { GrayRaster } from '../image/raster.js';

/** The cached value for (r, key), made by `make` the first time. */
export function oncePerRaster<T, R extends object = GrayRaster>(cache: WeakMap<R, Map<string, T>>, r: R, key: string, make: () => T): T {
  let known = cache.get(r);
  const hit = known?.get(key);
  if (hit !== undefined) return hit;
  const value = make();
  if (!known) {
    known = new Map();
    cache.set(r, known);
  }
  known.set(key, value);
  return value;
}
