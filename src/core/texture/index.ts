/** Texture (roughness) features: public API. */
export type { FeatureDefinition, FeatureOptions } from './types.js';
export { localStd, localVariance } from './localStd.js';
export {
  localEntropy,
  localEntropyInBox,
  intensityRange,
  type PixelBox,
  DEFAULT_ENTROPY_BINS,
  DEFAULT_ENTROPY_PERCENTILES,
  type LocalEntropyOptions,
} from './localEntropy.js';
export { gradientEnergy, gradientEnergyPointwise } from './gradientEnergy.js';
export { highPassEnergy, highPassEnergyPointwise } from './highPassEnergy.js';
export { boxMean } from './boxMean.js';
export { localDarkness, DARKNESS_FLOOR } from './localDarkness.js';
export { downsample } from './resample.js';
export {
  windowPxFromUm,
  defaultWindowUm,
  DEFAULT_WINDOW_MIN_PX,
  DEFAULT_WINDOW_MAX_PX,
  DEFAULT_WINDOW_RADIUS_FRACTION,
  DEFAULT_WINDOW_RULE,
  ASSUMED_RADIUS_FRACTION_OF_IMAGE,
  type DefaultWindowInput,
  type WindowRule,
} from './window.js';
export {
  FEATURES,
  FEATURE_NAMES,
  DEFAULT_FEATURES,
  computeFeature,
  isFeatureName,
  checkFeatureNames,
  parseFeatureList,
  toneOnly,
  TONE_FEATURES,
  type FeatureName,
} from './registry.js';
