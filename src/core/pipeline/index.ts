/** The measurement pipeline: one parameter object in, one versioned result out. */
export * from './types.js';
export { defaultParams, validateParams, canonicalJson, DEFAULT_FEATURES } from './params.js';
export { analyseImage, analyseDecoded } from './analyse.js';
export { remeasure } from './remeasure.js';
export { WorkingFrame, WORKING_LONG_SIDE_PX } from './frame.js';
export { CAUTION } from '../caution.js';
export type { Analysis } from './analyse.js';
export * from './result.js';
export { encodeOverlayPng } from './overlayPng.js';
export { HALVES_TOLERANCE_PCT, compareHalves } from './specimens.js';
