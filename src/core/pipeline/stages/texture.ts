/**
 * Stage 3, texture: the texture window (given in µm, or by the default rule from the specimen
 * radius, texture/window.ts) and the roughness feature maps on the working copy, with the local
 * mean brightness the classification normalises them by.
 */
import { oncePerRaster } from '../../segment/memo.js';
import type { Scale } from '../../calibrate/index.js';
import type { GrayRaster } from '../../image/raster.js';
import { boxMean, computeFeature, defaultWindowUm, FEATURES, windowPxFromUm, type FeatureName } from '../../texture/index.js';
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
  // once per working copy, window and features: every specimen of an image (both halves) uses the same
  const { maps, brightness } = oncePerRaster(TEXTURES, src, `${window.windowPxWork}|${input.features.join(',')}`, () => ({
    maps: input.features.map((name) => ({ name, raster: computeFeature(name, src, window.windowPxWork) })),
    brightness: boxMean(src, window.windowPxWork),
  }));
  return { window, maps, brightness };
}

/** Texture maps per working copy (segment/memo.ts); never written to. */
const TEXTURES = new WeakMap<GrayRaster, Map<string, Pick<TextureMaps, 'maps' | 'brightness'>>>();
