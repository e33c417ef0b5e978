/** Theory of Critical Distances: critical distance, stress fields, fits, rate laws, uncertainty, comparison, material sheets. */
export { criticalDistance, toughnessFromDistance, methodDistances, type MethodDistances, type TcdMethod } from './criticalDistance.js';
export {
  MPA_PER_KSI,
  MPA_SQRTM_PER_KSI_SQRTIN,
  parseQuantity,
  parseLoad,
  toEngineUnit,
  unitFactor,
  type Dimension,
  type Load,
  type UnitSystem,
} from './quantities.js';
export {
  sharpCrackCurve,
  bluntNotchCurve,
  holeCurve,
  kirschStressFromCentre,
  tabulatedCurve,
  scaleCurve,
  lineMeanStress,
  areaMeanStress,
  effectiveStress,
  maxCriticalDistance,
  type StressCurve,
  type AnalysisKind,
} from './stressCurve.js';
export { parseCurveCsv, type ParsedCurve } from './curveCsv.js';
export {
  predictFailureLoad,
  fitNotches,
  fitWithToughness,
  fromPlainSpecimens,
  type NotchSpecimen,
  type NotchFit,
  type FitNotchesOptions,
} from './notchFit.js';
export { parseRatePairsCsv, type RatePairs } from './rateCsv.js';
export { fitPowerLaw, evaluateRateLaw, type RateLaw, type PowerLawFit, type PowerFitStats, type RateValue } from './dynamic.js';
export { studentTQuantile, studentTCdf } from './studentT.js';
export { criticalDistanceUncertainty, scatterMoments, type Scatter, type DistanceUncertainty } from './uncertainty.js';
export {
  compareWidthWithL,
  impliedToughness,
  DEFAULT_TOLERANCE_PCT,
  type CompareInput,
  type CompareResult,
  type ImpliedToughness,
  type Verdict,
  type WidthReference,
} from './compare.js';
export {
  parseMaterialSheet,
  selectMaterial,
  splitMaterialRef,
  MATERIAL_SCHEMA,
  type Material,
  type MaterialValue,
  type SheetRateLaw,
} from './materials.js';
export { resolveCriticalDistance, type ResolveInput, type ResolvedDistance, type QuantityInput, type EchoedValue } from './resolve.js';
