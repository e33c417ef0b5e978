/**
 * Encode a render to a file: gray through the project's gray encoder; colour as 8-bit RGB PNG or JPEG,
 * or 8/16-bit RGB TIFF (the encoders' RGB inputs; a 16-bit colour PNG is refused — use TIFF).
 */
import { encodeGrayRaster, encodeJpeg, encodePng, encodeTiff, toUint16, type EncodeRasterOptions } from '../encode/index.js';
import { FractozoneError } from '../errors.js';
import { toUint8 } from '../image/raster.js';
import type { RenderResult, RgbRaster } from './fractograph.js';

/** Quantise interleaved RGB samples with the gray quantisers (round half up, clamped). */
function quantise(r: RgbRaster, bits: 8 | 16): Uint8Array | Uint16Array {
  const samples = { width: 3 * r.width, height: r.height, data: r.data };
  return bits === 16 ? toUint16(samples) : toUint8(samples);
}

/**
 * Encode a rendered image: `rgb` when the render is in colour, else `raster`.
 * @param o format, bit depth (8 or 16; JPEG 8 only), JPEG quality, pixel size to store, TIFF description
 * @returns file bytes
 * @throws FractozoneError BAD_PARAMETER for a 16-bit JPEG or a 16-bit colour PNG
 */
export function encodeRender(r: Pick<RenderResult, 'raster' | 'rgb'>, o: EncodeRasterOptions): Uint8Array {
  if (!r.rgb) return encodeGrayRaster(r.raster, o);
  const rgb = r.rgb;
  const bits = o.bitDepth ?? 8;
  if (bits !== 8 && bits !== 16) throw new FractozoneError('BAD_PARAMETER', `bit depth must be 8 or 16, got ${String(bits)}`);
  switch (o.format) {
    case 'png':
      if (bits === 16) throw new FractozoneError('BAD_PARAMETER', 'a colour render is written as 8-bit PNG only; use .tif for 16-bit colour');
      return encodePng(
        { width: rgb.width, height: rgb.height, data: quantise(rgb, 8) as Uint8Array, layout: 'rgb8' },
        o.umPerPx !== undefined ? { physUmPerPx: o.umPerPx, physUmPerPxY: o.umPerPxY ?? o.umPerPx } : {},
      );
    case 'jpeg':
      if (bits !== 8) throw new FractozoneError('BAD_PARAMETER', 'JPEG files are 8-bit only; use PNG or TIFF for 16 bits');
      return encodeJpeg({ width: rgb.width, height: rgb.height, data: quantise(rgb, 8) as Uint8Array, channels: 3 }, o.jpegQuality ?? 90);
    case 'tiff':
      return encodeTiff({
        width: rgb.width,
        height: rgb.height,
        data: quantise(rgb, bits),
        samplesPerPixel: 3,
        ...(o.umPerPx !== undefined ? { umPerPxX: o.umPerPx, umPerPxY: o.umPerPxY ?? o.umPerPx } : {}),
        ...(o.description !== undefined ? { description: o.description } : {}),
      });
    default:
      throw new FractozoneError('BAD_PARAMETER', `unknown image format "${String(o.format)}" (use png, jpeg or tiff)`);
  }
}
