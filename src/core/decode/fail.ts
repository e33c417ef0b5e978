/** Internal helpers for decoder errors: every refusal is a FractozoneError with a stable code. */
import { FractozoneError, isFractozoneError, type ErrorCode } from '../errors.js';
import { printable } from '../text/printable.js';

/**
 * Internal: throw a FractozoneError (kind 'input'). The message may quote bytes of the file (a
 * chunk name, a decoder's text): control characters in it are escaped (`\x00`, `\x1b`).
 */
export function fail(code: ErrorCode, message: string): never {
  throw new FractozoneError(code, printable(message), 'input');
}

/**
 * Internal: run a third-party decoder and turn anything it throws (Error, string, RangeError from
 * a bad typed-array offset ...) into CORRUPT_IMAGE with a one-line message; FractozoneErrors pass.
 */
export function guard<T>(what: string, fn: () => T): T {
  try {
    return fn();
  } catch (e) {
    if (isFractozoneError(e)) throw e;
    const raw = e instanceof Error ? e.message : String(e);
    const first = raw.split('\n')[0].replace(/\s+/g, ' ').trim().slice(0, 160);
    return fail('CORRUPT_IMAGE', `the ${what} data could not be decoded (${first || 'unknown decoder error'})`);
  }
}

/** Internal: refuse an image whose size is zero or above the pixel budget (call before allocating). */
export function checkSize(format: string, width: number, height: number, maxPixels: number): void {
  if (!(width > 0) || !(height > 0)) {
    fail('ZERO_SIZE_IMAGE', `the ${format} image has a width or height of 0 px (${width}×${height} px)`);
  }
  if (width * height > maxPixels) {
    fail(
      'IMAGE_TOO_LARGE',
      `the ${format} image is ${width}×${height} px (${((width * height) / 1e6).toFixed(1)} megapixels), above the limit of ${(maxPixels / 1e6).toFixed(1)} megapixels`,
    );
  }
}
