/**
 * Optional native zlib, supplied by a shell (like the OpenCV runtime in cv.ts): core stays pure and
 * never imports `node:zlib`; the Node shells (`src/cli/nodeZlib.ts`) hand it over with `setZlib`,
 * the browser sets nothing and keeps the JavaScript decoders.
 *
 * Used by the PNG decoder (decode/png.ts) for the image data of non-interlaced files: the
 * decoded pixels are the same byte for byte as through the JavaScript path (tests/core/decode/
 * pngNative.test.ts), anything unusual falls back to that path. Measured on a rendered 12-MP 8-bit
 * PNG (2026-12-02): fflate's inflate + fast-png's CRC and unfiltering ≈ 0.45 s of the decode in a
 * whole `measure`, Node's zlib ≈ 0.03 s.
 */

/** What a shell provides: RFC 1950 inflate and the CRC-32 of PNG chunks (ISO 3309). */
export interface NativeZlib {
  /**
   * Inflate a whole zlib stream. Throws on a damaged stream or when the output would exceed
   * `maxLength` bytes (the caller then falls back to the JavaScript decoder).
   */
  inflate(data: Uint8Array, maxLength: number): Uint8Array;
  /** CRC-32 (polynomial 0xEDB88320) of `data`, as an unsigned 32-bit integer. */
  crc32(data: Uint8Array): number;
}

let instance: NativeZlib | undefined;

/** Hands a native zlib to core (called once by a Node shell); `undefined` removes it. */
export function setZlib(z: NativeZlib | undefined): void {
  instance = z;
}

/** The native zlib, or undefined (browser, tests of the JavaScript path). */
export function getZlib(): NativeZlib | undefined {
  return instance;
}
