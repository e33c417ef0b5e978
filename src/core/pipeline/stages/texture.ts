/**
 * Stage 3, texture: the texture window (given in µm, or by the default rule from the specimen
 * radius, texture/window.ts) and the roughness feature maps on the working copy, with the local
 * mean brightness the classification normalises them by.
 */
import { oncePerRaster } from '../../segment/memo.js';
import { setBox } from '../../segment/cvutil.js';
import type { Scale } from '../../calibrate/index.js';
import type { GrayRaster } from '../../image/raster.js';
import { boxMean, computeFeature, defaultWindowUm, FEATURES, localEntropyInBox, windowPxFromUm, type FeatureName, type PixelBox } from '../../texture/index.js';
import type { WorkingFrame } from '../frame.js';
import type { SpecimenLocation } from './locateSpecimen.js';

/** The texture window in µm and in px at both resolutions (odd). */
export interface TextureWindow {
  windowUm: number;
  /** At working resolution (where the features are computed). */
  windowPxWork: number;
  /** At full resolution (reported; sets the narrowest band the automatic boundary resolves). */
  windowPxFull: number;
}

/** Input of {@link textureWindow}. */
export interface WindowInput {
  frame: WorkingFrame;
  scale: Scale;
  location: SpecimenLocation;
  /** Window side given by the user, µm, or null for the default rule. */
  windowUm: number | null;
  /** The features the window is for: the default is the widest of their default windows. */
  features: readonly FeatureName[];
}

/** One roughness map on the working copy. */
export interface FeatureMap {
  name: FeatureName;
  raster: GrayRaster;
}

/** Output of {@link computeTexture}. */
export interface TextureMaps {
  window: TextureWindow;
  maps: FeatureMap[];
  /** Local mean brightness over the window (working copy). */
  brightness: GrayRaster;
}

/** Input of {@link computeTexture}. */
export interface TextureInput {
  frame: WorkingFrame;
  window: TextureWindow;
  features: readonly FeatureName[];
  /** The working copy the features are computed on, when not frame.work (e.g. with glints suppressed). */
  source?: GrayRaster;
  /**
   * Working px where the maps are read (the classification reads the specimen's interior only; see
   * {@link specimenBox}): the local entropy, the costliest map, is then computed there only (the same
   * values, 0 elsewhere; texture/localEntropy.ts `localEntropyInBox`). Default: everywhere.
   */
  region?: PixelBox;
}

/**
 * Margin of the region the maps are read in, working px: a map binned 3 × 3 for the parameter
 * range (stages/uncertainty.ts `BIN`) averages pixels up to one px beyond the mask; 3 leaves room.
 */
export const REGION_MARGIN_PX = 3;

/**
 * The specimen mask's bounding box (working px) grown by `margin` px: where the classification can
 * read a feature map (its interior lies inside the mask; a binned map's block reaches one block
 * beyond its centre pixel, so callers pass at least the bin size).
 */
export function specimenBox(location: SpecimenLocation, margin: number): PixelBox {
  const m = location.specimen.mask;
  const b = setBox(m.data, m.width, m.height);
  return b ? { x0: b.x0 - margin, y0: b.y0 - margin, x1: b.x1 + margin, y1: b.y1 + margin } : { x0: 0, y0: 0, x1: -1, y1: -1 };
}

/**
 * The window used for this image (also for a manual boundary, where it sets the narrowest band
 * counted): the given one, or the widest default window of the chosen features (the features are
 * combined pixel by pixel, so they share one window).
 */
export function textureWindow(input: WindowInput): TextureWindow {
  const { frame, scale } = input;
  const defaultUm = (): number =>
    Math.max(...input.features.map((f) => defaultWindowUm({ umPerPx: scale.umPerPx, specimenRadiusUm: input.location.radiusUm, scaleFactor: frame.factor, rule: FEATURES[f].defaultWindow })));
  const windowUm = input.windowUm ?? defaultUm();
  return {
    windowUm,
    windowPxWork: windowPxFromUm(windowUm, scale.umPerPx * frame.lengthScale),
    windowPxFull: windowPxFromUm(windowUm, scale.umPerPx),
  };
}

/** Computes the feature maps and the brightness on the working copy. */
export function computeTexture(input: TextureInput): TextureMaps {
  const { frame, window } = input;
  const src = input.source ?? frame.work;
  const box = input.region;
  const inBox = (name: FeatureName): boolean => box !== undefined && name === 'localEntropy';
  // once per working copy, window and features: every specimen of an image (both halves) uses the same
  const { maps, brightness } = oncePerRaster(TEXTURES, src, `${window.windowPxWork}|${input.features.join(',')}|${box ? 'box' : 'all'}`, () => ({
    maps: input.features.map((name) => ({ name, raster: inBox(name) ? null : computeFeature(name, src, window.windowPxWork) })),
    brightness: windowMean(src, window.windowPxWork),
  }));
  // the entropy inside the region: once per working copy, window and region
  const own = (name: FeatureName): GrayRaster =>
    oncePerRaster(TEXTURES_IN_BOX, src, `${window.windowPxWork}|${name}|${box!.x0},${box!.y0},${box!.x1},${box!.y1}`, () => localEntropyInBox(src, window.windowPxWork, box!));
  return { window, maps: maps.map((m) => ({ name: m.name, raster: m.raster ?? own(m.name) })), brightness };
}

/**
 * The local mean brightness over the window, once per raster and window: the texture and the tone
 * pass (stages/band.ts) normalise by it and the tone boundary is refined on it (stages/refineBoundary.ts).
 */
export function windowMean(src: GrayRaster, windowPx: number): GrayRaster {
  return oncePerRaster(MEANS, src, String(windowPx), () => boxMean(src, windowPx));
}
const MEANS = new WeakMap<GrayRaster, Map<string, GrayRaster>>();

/** Texture maps per working copy (segment/memo.ts); never written to. Maps left to {@link TEXTURES_IN_BOX} are null. */
const TEXTURES = new WeakMap<GrayRaster, Map<string, { maps: { name: FeatureName; raster: GrayRaster | null }[]; brightness: GrayRaster }>>();
/** Maps computed inside a region only, per working copy. */
const TEXTURES_IN_BOX = new WeakMap<GrayRaster, Map<string, GrayRaster>>();
