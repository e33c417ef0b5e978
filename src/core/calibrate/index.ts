/** Scale calibration: typed pixel size, two points, file metadata, automatic scale-bar detection. */
export {
  scaleFromPixelSize,
  scaleFromTwoPoints,
  scaleFromMetadata,
  scaleFromBar,
  chooseScale,
  lengthUmBetween,
} from './scale.js';
export type { Scale, ScaleSource, TwoPointInput, ScaleChoiceInput, MetadataScaleLike } from './scale.js';
export { detectScaleBar, DEFAULT_MIN_CONFIDENCE } from './scaleBar.js';
export type { ScaleBar, ScaleBarOptions } from './scaleBar.js';
