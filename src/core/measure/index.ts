/** Band-width measurement: ray geometry, width profile, statistics. */
export type { RayIndex } from './geometry.js';
export { rayDirection, angleOf, buildRayIndex, castRay, polygonArea, distanceToPolygon } from './geometry.js';
export type { RayReason, RayMeasure, PixelSize, BandMeasureOptions, MeasureBandInput, BandProfile } from './band.js';
export { measureBand, measureFromPolygons, createBandMeasurer, isExcluded } from './band.js';
export type { WidthStatistics, WidthStatisticsOptions } from './statistics.js';
export { widthStatistics, autocorrelation, lag1Autocorrelation, effectiveSampleSize, effectiveSampleSizeOf, robustOutlierFlags } from './statistics.js';
export { studentTCdf, studentTInv, incompleteBeta, lnGamma } from './tdist.js';
