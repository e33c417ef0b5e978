/**
 * The feature registry: one line per feature. To add a feature, write `src/core/texture/<name>.ts`
 * exporting a `FeatureDefinition` (see types.ts) and add it below; `FeatureName` follows.
 */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import { gradientEnergyFeature } from './gradientEnergy.js';
import { highPassEnergyFeature } from './highPassEnergy.js';
import { localEntropyFeature } from './localEntropy.js';
import { localStdFeature, localVarianceFeature } from './localStd.js';
import { downsample } from './resample.js';
import type { FeatureDefinition, FeatureOptions } from './types.js';

/** All roughness features by name. */
export const FEATURES = {
  localStd: localStdFeature,
  localEntropy: localEntropyFeature,
  gradientEnergy: gradientEnergyFeature,
  localVariance: localVarianceFeature,
  highPassEnergy: highPassEnergyFeature,
} as const satisfies Record<string, FeatureDefinition>;

/** Name of a registered feature. */
export type FeatureName = keyof typeof FEATURES;

/** The three features the pipeline combines by default. */
export const CORE_FEATURES: readonly FeatureName[] = ['localStd', 'localEntropy', 'gradientEnergy'];

/** True when `name` is a registered feature. */
export function isFeatureName(name: string): name is FeatureName {
  return Object.prototype.hasOwnProperty.call(FEATURES, name);
}

/**
 * Computes one registered feature.
 *
 * @param name feature name (see {@link FEATURES})
 * @param raster gray raster (0..1)
 * @param windowPx odd window side in px at the raster's resolution
 * @param opts further options (entropy bins and range)
 * @returns feature map of the same size; unit in `FEATURES[name].unit`
 */
export function computeFeature(
  name: FeatureName | string,
  raster: GrayRaster,
  windowPx: number,
  opts: Omit<FeatureOptions, 'windowPx'> = {},
): GrayRaster {
  if (!isFeatureName(name)) {
    throw new FractozoneError('BAD_PARAMETER', `unknown roughness feature "${name}" (known: ${Object.keys(FEATURES).join(', ')})`);
  }
  return FEATURES[name].compute(raster, { ...opts, windowPx });
}

/** Options of {@link computeFeaturesAt}. */
export interface FeaturesAtOptions extends Omit<FeatureOptions, 'windowPx'> {
  /** Full-resolution px per working px (≥ 1); 1 = full resolution. */
  scaleFactor: number;
  /** Odd window side in px at the working (downsampled) resolution. */
  windowPx: number;
  /** Features to compute; default {@link CORE_FEATURES}. */
  features?: readonly FeatureName[];
}

/** Result of {@link computeFeaturesAt}. */
export interface FeaturesAt {
  /** The factor used (full-resolution px per working px, per axis as realised by rounding). */
  scaleX: number;
  scaleY: number;
  /** The requested factor. */
  scaleFactor: number;
  /** The working raster (area-averaged). */
  raster: GrayRaster;
  /** Feature maps at working resolution. */
  features: Partial<Record<FeatureName, GrayRaster>>;
}

/**
 * Computes several features on an area-averaged downsampled copy of `r` (see `downsample`), for a
 * classification at reduced resolution. A working pixel (i, j) covers full-resolution pixels
 * around ((i + 0.5)·scaleX − 0.5, (j + 0.5)·scaleY − 0.5).
 *
 * @param r gray raster (0..1) at full resolution
 * @param opts scale factor, window at working resolution, feature list, entropy options
 */
export function computeFeaturesAt(r: GrayRaster, opts: FeaturesAtOptions): FeaturesAt {
  const names = opts.features ?? CORE_FEATURES;
  for (const n of names) {
    if (!isFeatureName(n)) {
      throw new FractozoneError('BAD_PARAMETER', `unknown roughness feature "${String(n)}" (known: ${Object.keys(FEATURES).join(', ')})`);
    }
  }
  const work = downsample(r, opts.scaleFactor);
  const { scaleFactor, windowPx, features: _ignored, ...rest } = opts;
  void _ignored;
  const features: Partial<Record<FeatureName, GrayRaster>> = {};
  for (const n of names) features[n] = computeFeature(n, work, windowPx, rest);
  return { scaleX: r.width / work.width, scaleY: r.height / work.height, scaleFactor, raster: work, features };
}
