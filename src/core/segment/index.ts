/** Segmentation: specimen outline, rim/core classification, boundary refinement. */
export type { SpecimenOptions, Specimen } from './specimen.js';
export { findSpecimen } from './specimen.js';
export { coarseForeground, type CoarseForeground, type ForegroundOptions } from './foreground.js';
export { listSpecimens, separatedForeground, type ListSpecimenOptions } from './severalSpecimens.js';
export type { CircleFit, EllipseFit } from './fit.js';
export { fitCircle, fitEllipseToPoints } from './fit.js';
export type { RimCoreOptions, RimCoreResult, Separability } from './rimCore.js';
export { classifyRimCore } from './rimCore.js';
export type { RefineBoundaryOptions, RefinedBoundary } from './refine.js';
export { refineBoundary, boxEnergy } from './refine.js';
export type { RefineOuterOptions } from './outerEdge.js';
export { refineOuterEdge } from './outerEdge.js';
export type { GlintSuppression } from './glints.js';
export { suppressGlints } from './glints.js';
export { scaleMarkBoxes, paintOutBoxes, MARK_PAD_PX } from './marks.js';
