/** The measurement pipeline: one parameter object in, one versioned result out. */
export * from './types.js';
export { defaultParams, validateParams, canonicalJson, DEFAULT_FEATURES } from './params.js';
export { analyseImage, analyseDecoded, remeasure, CAUTION, WORKING_LONG_SIDE_PX } from './analyse.js';
export type { MeasureResult, Analysis, InputInfo, ProgressFn } from './analyse.js';
export { encodeOverlayPng } from './overlayPng.js';
