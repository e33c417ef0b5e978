/** Encode a 0..1 gray raster to a file format in one call (used by the render command and samples). */
import { FractozoneError } from '../errors.js';
import { toUint8, type GrayRaster } from '../image/raster.js';
import { encodeJpeg } from './jpeg.js';
import { encodePng } from './png.js';
import { toUint16 } from './quantise.js';
import { encodeTiff } from './tiff.js';

export type RasterFormat = 'png' | 'jpeg' | 'tiff';

export interface EncodeRasterOptions {
  readonly format: RasterFormat;
  /** 8 or 16 (JPEG is always 8) */
  readonly bitDepth?: 8 | 16;
  /** JPEG quality 1..100 (default 90) */
  readonly jpegQuality?: number;
  /** pixel size µm/px to store in the file (PNG pHYs, TIFF resolution); JPEG stores none */
  readonly umPerPx?: number;
  readonly umPerPxY?: number;
  /** TIFF ImageDescription (ASCII) */
  readonly description?: string;
}

/**
 * Quantise and encode a gray raster (values 0..1, clamped; round half up).
 * @returns file bytes
 */
export function encodeGrayRaster(r: GrayRaster, o: EncodeRasterOptions): Uint8Array {
  const depth = o.bitDepth ?? 8;
  if (depth !== 8 && depth !== 16) throw new FractozoneError('BAD_PARAMETER', `bit depth must be 8 or 16, got ${String(depth)}`);
  switch (o.format) {
    case 'png':
      return encodePng(
        depth === 16 ? { width: r.width, height: r.height, data: toUint16(r), layout: 'gray16' } : { width: r.width, height: r.height, data: toUint8(r), layout: 'gray8' },
        o.umPerPx !== undefined ? { physUmPerPx: o.umPerPx, physUmPerPxY: o.umPerPxY ?? o.umPerPx } : {},
      );
    case 'jpeg':
      if (depth !== 8) throw new FractozoneError('BAD_PARAMETER', 'JPEG files are 8-bit only; use PNG or TIFF for 16 bits');
      return encodeJpeg({ width: r.width, height: r.height, data: toUint8(r), channels: 1 }, o.jpegQuality ?? 90);
    case 'tiff':
      return encodeTiff({
        width: r.width,
        height: r.height,
        data: depth === 16 ? toUint16(r) : toUint8(r),
        samplesPerPixel: 1,
        ...(o.umPerPx !== undefined ? { umPerPxX: o.umPerPx, umPerPxY: o.umPerPxY ?? o.umPerPx } : {}),
        ...(o.description !== undefined ? { description: o.description } : {}),
      });
    default:
      throw new FractozoneError('BAD_PARAMETER', `unknown image format "${String(o.format)}" (use png, jpeg or tiff)`);
  }
}
