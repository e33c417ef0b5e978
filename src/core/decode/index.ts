/** Public API of the image decoders. */
export { decodeImage, readImageHeader } from './decode.js';
export { sniffFormat } from './sniff.js';
export { lumaFromRgb, LUMA_WEIGHTS_REC709 } from './luma.js';
export { DEFAULT_MAX_PIXELS } from './types.js';
export type { DecodedImage, DecodeOptions, ImageFormat, ImageHeader, MetadataScale } from './types.js';
