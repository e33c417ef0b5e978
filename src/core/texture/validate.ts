/** Input checks shared by the texture features (private to the folder). */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';

/** Refuses a raster whose size or data length is inconsistent. */
export function checkRaster(r: GrayRaster, what = 'image'): void {
  const ok =
    r !== null &&
    typeof r === 'object' &&
    Number.isInteger(r.width) &&
    Number.isInteger(r.height) &&
    r.width > 0 &&
    r.height > 0 &&
    r.data instanceof Float32Array &&
    r.data.length === r.width * r.height;
  if (!ok) {
    throw new FractozoneError('BAD_PARAMETER', `the ${what} for the roughness feature is not a valid gray raster`);
  }
}

/** Refuses a window side that is not an odd integer ≥ 3. Returns the half width r = (w − 1) / 2. */
export function checkWindow(windowPx: number): number {
  if (!Number.isInteger(windowPx) || windowPx < 3 || windowPx % 2 === 0) {
    throw new FractozoneError('BAD_PARAMETER', `the texture window must be an odd whole number of pixels ≥ 3, got ${windowPx}`);
  }
  return (windowPx - 1) / 2;
}

/**
 * Box features mirror the image at its edges (reflect-101); that needs the window to fit in the
 * image. Refuses a window larger than the smaller image side.
 */
export function checkWindowFits(windowPx: number, width: number, height: number): number {
  const r = checkWindow(windowPx);
  if (windowPx > Math.min(width, height)) {
    throw new FractozoneError(
      'BAD_PARAMETER',
      `the texture window (${windowPx} px) is larger than the image (${width}×${height} px); use a smaller window or a larger image`,
    );
  }
  return r;
}

/** Thrown when a raster holds NaN or infinite values. */
export function nonFinite(): never {
  throw new FractozoneError('PROCESSING_FAILED', 'the image holds values that are not finite numbers', 'processing');
}
