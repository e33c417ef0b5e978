/** Image encoders (pure TS, deterministic byte for byte). */
export { encodePng, pxPerMetre, crc32, type PngImageInput, type PngEncodeOptions, type PngLayout } from './png.js';
export { encodeJpeg, type JpegImageInput } from './jpeg.js';
export { encodeTiff, type TiffImageInput } from './tiff.js';
export { toUint16 } from './quantise.js';
export { encodeGrayRaster, type EncodeRasterOptions, type RasterFormat } from './raster.js';
