/**
 * One entry point for all formats: bytes → luminance raster + what the file says about itself.
 */
import { FractozoneError } from '../errors.js';
import { fail } from './fail.js';
import { decodeJpegImage, readJpegHeader } from './jpeg.js';
import { decodePngImage, readPngHeader } from './png.js';
import { describeNonImage, sniffFormat } from './sniff.js';
import { decodeTiffImage, readTiffHeader } from './tiff.js';
import { DEFAULT_MAX_PIXELS, type DecodedImage, type DecodeOptions, type ImageFormat, type ImageHeader } from './types.js';

function formatOf(bytes: Uint8Array): ImageFormat {
  if (!(bytes instanceof Uint8Array)) fail('NOT_AN_IMAGE', 'the input is not a byte array');
  if (bytes.length === 0) fail('EMPTY_INPUT', 'the file is empty (0 bytes)');
  const f = sniffFormat(bytes);
  if (!f) {
    if (bytes.length < 8) fail('NOT_AN_IMAGE', `the file is too short to be an image (${bytes.length} bytes)`);
    fail('NOT_AN_IMAGE', `the file is not a PNG, JPEG or TIFF image (it looks like ${describeNonImage(bytes)})`);
  }
  return f;
}

/**
 * Read format, size, bit depth and channel count from the header only (no pixel decode).
 *
 * @param bytes - the whole file, or at least its header (TIFF: up to the first image directory)
 * @returns format, width and height (px), source bits per sample, source samples per pixel
 * @throws FractozoneError EMPTY_INPUT, NOT_AN_IMAGE, TRUNCATED_IMAGE, CORRUPT_IMAGE, ZERO_SIZE_IMAGE
 */
export function readImageHeader(bytes: Uint8Array): ImageHeader {
  const f = formatOf(bytes);
  return f === 'png' ? readPngHeader(bytes) : f === 'jpeg' ? readJpegHeader(bytes) : readTiffHeader(bytes);
}

/**
 * Decode a PNG, JPEG or TIFF file to a Float32 luminance raster 0..1 (first page of a TIFF).
 *
 * Colour is reduced with the Rec. 709 / sRGB weights Y = 0.2126 R + 0.7152 G + 0.0722 B (ITU-R
 * BT.709-6, Table 3) applied to the encoded values, without gamma linearisation; alpha is ignored;
 * palettes are expanded first; 16-bit samples keep full precision (value / 65535); 1/2/4-bit values
 * are divided by 2^bits − 1. Width and height are read from the header (PNG IHDR, JPEG SOFn, TIFF
 * IFD) and checked against `maxPixels` before any pixel buffer is allocated.
 *
 * @param bytes - the whole file
 * @param options - `maxPixels`: largest width × height accepted, px (default 100 000 000)
 * @returns the decoded image with its raster, source description and metadata pixel size (µm/px)
 * @throws FractozoneError EMPTY_INPUT, NOT_AN_IMAGE, UNSUPPORTED_IMAGE, CORRUPT_IMAGE,
 *   TRUNCATED_IMAGE, ZERO_SIZE_IMAGE, IMAGE_TOO_LARGE (never a decoder's own exception)
 */
export function decodeImage(bytes: Uint8Array, options: DecodeOptions = {}): DecodedImage {
  const maxPixels = options.maxPixels ?? DEFAULT_MAX_PIXELS;
  if (!(maxPixels > 0)) {
    throw new FractozoneError('BAD_PARAMETER', `the pixel budget must be a positive number of pixels, got ${maxPixels}`);
  }
  const f = formatOf(bytes);
  if (f === 'png') return decodePngImage(bytes, maxPixels);
  if (f === 'jpeg') return decodeJpegImage(bytes, maxPixels);
  return decodeTiffImage(bytes, maxPixels);
}
