/**
 * The feature registry: one line per feature. To add a feature, write `src/core/texture/<name>.ts`
 * exporting a `FeatureDefinition` (see types.ts) and add it below; `FeatureName` follows.
 */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import { gradientEnergyFeature } from './gradientEnergy.js';
import { highPassEnergyFeature } from './highPassEnergy.js';
import { localDarknessFeature } from './localDarkness.js';
import { localEntropyFeature } from './localEntropy.js';
import { localStdFeature, localVarianceFeature } from './localStd.js';
import type { FeatureDefinition, FeatureOptions } from './types.js';

/** All roughness features by name. */
export const FEATURES = {
  localStd: localStdFeature,
  localEntropy: localEntropyFeature,
  gradientEnergy: gradientEnergyFeature,
  localVariance: localVarianceFeature,
  highPassEnergy: highPassEnergyFeature,
  localDarkness: localDarknessFeature,
} as const satisfies Record<string, FeatureDefinition>;

/** Name of a registered feature. */
export type FeatureName = keyof typeof FEATURES;

/**
 * The features the pipeline combines when none are chosen: the one default list, used by the
 * parameters, the command line (`--features`), the app and the README.
 */
export const DEFAULT_FEATURES: readonly FeatureName[] = ['localStd', 'localEntropy', 'gradientEnergy'];

/** The tone cue the pipeline tries when the texture contrast is weak (pipeline/stages/band.ts). */
export const TONE_FEATURES: readonly FeatureName[] = ['localDarkness'];

/** True when every feature of the list reads tone, not texture (then the boundary is refined on brightness). */
export function toneOnly(names: readonly FeatureName[]): boolean {
  return names.length > 0 && names.every((n) => FEATURES[n].cue === 'tone');
}

/** Every registered feature name, in registry order. */
export const FEATURE_NAMES = Object.keys(FEATURES) as FeatureName[];

/** True when `name` is a registered feature. */
export function isFeatureName(name: string): name is FeatureName {
  return Object.prototype.hasOwnProperty.call(FEATURES, name);
}

function unknownFeature(name: string): FractozoneError {
  return new FractozoneError('BAD_PARAMETER', `unknown roughness feature "${name}" (known: ${FEATURE_NAMES.join(', ')})`);
}

/**
 * Checks a list of feature names (from parameters or JSON) and returns it typed.
 * @throws FractozoneError BAD_PARAMETER naming the first unknown feature, or for an empty list
 */
export function checkFeatureNames(names: readonly unknown[]): FeatureName[] {
  if (names.length === 0) throw new FractozoneError('BAD_PARAMETER', 'at least one roughness feature is needed');
  return names.map((n) => {
    if (typeof n !== 'string' || !isFeatureName(n)) throw unknownFeature(String(n));
    return n;
  });
}

/**
 * Parses a comma-separated feature list ("localStd,localEntropy").
 * @throws FractozoneError BAD_PARAMETER for an unknown or no feature
 */
export function parseFeatureList(text: string): FeatureName[] {
  return checkFeatureNames(text.split(',').map((s) => s.trim()).filter(Boolean));
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
  name: FeatureName,
  raster: GrayRaster,
  windowPx: number,
  opts: Omit<FeatureOptions, 'windowPx'> = {},
): GrayRaster {
  if (!isFeatureName(name)) throw unknownFeature(name);
  return FEATURES[name].compute(raster, { ...opts, windowPx });
}
