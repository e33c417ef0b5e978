/**
 * Painting a {@link Coverage} into an RGBA image or a gray raster with alpha blending
 * ("over" compositing, Porter & Duff, Computer Graphics 18(3), 1984).
 */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import type { Coverage, Ink, RgbaImage } from './types.js';

/**
 * Create an RGBA image filled with one colour.
 * @param width px
 * @param height px
 * @param fill [r, g, b, a] 0..255 (default opaque black)
 */
export function createRgbaImage(width: number, height: number, fill: readonly [number, number, number, number] = [0, 0, 0, 255]): RgbaImage {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new FractozoneError('BAD_PARAMETER', `image size must be positive whole numbers of pixels, got ${width}×${height}`);
  }
  const data = new Uint8ClampedArray(width * height * 4);
  data.set(fill.slice(0, 4));
  // doubling block copies (memmove) instead of a per-byte loop
  for (let len = 4; len < data.length; len *= 2) data.copyWithin(len, 0, Math.min(len, data.length - len));
  return { width, height, data };
}

function inkAlpha(ink: Ink): number {
  const a = ink.alpha ?? 1;
  if (!(a >= 0 && a <= 1)) throw new FractozoneError('BAD_PARAMETER', `ink opacity must be between 0 and 1, got ${a}`);
  return a;
}

/**
 * Blend `ink` into an RGBA image wherever `cov` covers it: out = ink·α + dst·(1 − α) with
 * α = coverage × ink opacity; destination alpha becomes α + a_dst·(1 − α).
 */
export function paintRgba(img: RgbaImage, cov: Coverage, ink: Ink): void {
  const alpha = inkAlpha(ink);
  let r: number;
  let g: number;
  let b: number;
  if ('rgb' in ink) [r, g, b] = ink.rgb;
  else r = g = b = ink.gray * 255;
  const d = img.data;
  for (let yy = 0; yy < cov.height; yy++) {
    const y = cov.y0 + yy;
    if (y < 0 || y >= img.height) continue;
    for (let xx = 0; xx < cov.width; xx++) {
      const x = cov.x0 + xx;
      if (x < 0 || x >= img.width) continue;
      const a = cov.data[yy * cov.width + xx] * alpha;
      if (a <= 0) continue;
      const i = (y * img.width + x) * 4;
      d[i] = r * a + d[i] * (1 - a);
      d[i + 1] = g * a + d[i + 1] * (1 - a);
      d[i + 2] = b * a + d[i + 2] * (1 - a);
      d[i + 3] = 255 * a + d[i + 3] * (1 - a);
    }
  }
}

/**
 * Blend `ink` into a gray raster (values 0..1): out = v·α + dst·(1 − α), α = coverage × opacity.
 */
export function paintGray(r: GrayRaster, cov: Coverage, ink: Ink): void {
  const alpha = inkAlpha(ink);
  const v = 'gray' in ink ? ink.gray : (0.2126 * ink.rgb[0] + 0.7152 * ink.rgb[1] + 0.0722 * ink.rgb[2]) / 255;
  const d = r.data;
  for (let yy = 0; yy < cov.height; yy++) {
    const y = cov.y0 + yy;
    if (y < 0 || y >= r.height) continue;
    for (let xx = 0; xx < cov.width; xx++) {
      const x = cov.x0 + xx;
      if (x < 0 || x >= r.width) continue;
      const a = cov.data[yy * cov.width + xx] * alpha;
      if (a <= 0) continue;
      const i = y * r.width + x;
      d[i] = v * a + d[i] * (1 - a);
    }
  }
}

/** Paint into whichever target type is given (RGBA image or gray raster). */
export function paint(target: RgbaImage | GrayRaster, cov: Coverage, ink: Ink): void {
  if (target.data instanceof Uint8ClampedArray) paintRgba(target as RgbaImage, cov, ink);
  else paintGray(target as GrayRaster, cov, ink);
}
