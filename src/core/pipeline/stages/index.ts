/**
 * The pipeline stages in their order (see analyse.ts):
 * calibrate → locate specimen → texture → classify → refine boundary → measure → compare → quality → assemble.
 */
export { calibrate, type CalibrateInput, type Calibration } from './calibrate.js';
export { locateSpecimen, type LocateInput, type SpecimenLocation } from './locateSpecimen.js';
export { textureWindow, computeTexture, type WindowInput, type TextureWindow, type TextureInput, type TextureMaps, type FeatureMap } from './texture.js';
export { classifyTexture, type ClassifyInput, type Classification } from './classify.js';
export { refineRimBoundary, manualBoundary, type RefineInput, type RimBoundary } from './refineBoundary.js';
export { measureWidths, minWidthPxFor, type MeasureInput, type StoredGeometry, type WidthMeasurement } from './measure.js';
export { compareWithCriticalDistance, type CompareStageInput, type CriticalDistanceBlocks } from './compare.js';
export { judgeQuality, assessQuality, ruleWarnings, QUALITY_RULES, RULE_CODES, type QualityRule, type RuleInput, type QualityInput, type QualityOutput } from './quality.js';
export {
  assembleResult,
  assembleBand,
  assembleScale,
  reportWidths,
  storedGeometry,
  withMeasurement,
  NO_CROSSING_REASON,
  type AssembleInput,
  type MeasuredBand,
} from './assemble.js';
