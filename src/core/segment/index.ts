/** Segmentation: specimen outline, rim/core classification, boundary refinement. */
export type { SpecimenOptions, Specimen } from './specimen.js';
export { findSpecimen } from './specimen.js';
export type { CircleFit, EllipseFit } from './fit.js';
export { fitCircle, fitEllipseToPoints } from './fit.js';
