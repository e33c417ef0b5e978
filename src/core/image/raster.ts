/**
 * The engine's image types. A raster is plain data (no methods) so that it crosses worker
 * boundaries by structured clone / transfer. Row-major, origin top-left, x to the right, y down.
 */

/** Gray raster, luminance in 0..1 (Float32). */
export interface GrayRaster {
  readonly width: number;
  readonly height: number;
  readonly data: Float32Array;
}

/** Binary mask: 1 = inside, 0 = outside. */
export interface Mask {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8Array;
}

export function createRaster(width: number, height: number, data?: Float32Array): GrayRaster {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new RangeError(`raster size must be positive integers, got ${width}×${height}`);
  }
  const d = data ?? new Float32Array(width * height);
  if (d.length !== width * height) {
    throw new RangeError(`raster data length ${d.length} does not match ${width}×${height}`);
  }
  return { width, height, data: d };
}

export function createMask(width: number, height: number, data?: Uint8Array): Mask {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new RangeError(`mask size must be positive integers, got ${width}×${height}`);
  }
  const d = data ?? new Uint8Array(width * height);
  if (d.length !== width * height) {
    throw new RangeError(`mask data length ${d.length} does not match ${width}×${height}`);
  }
  return { width, height, data: d };
}

/** Quantise a 0..1 raster to 8 bits (round half up, clamped). */
export function toUint8(r: GrayRaster): Uint8Array {
  const out = new Uint8Array(r.data.length);
  const d = r.data;
  for (let i = 0; i < d.length; i++) {
    const v = d[i] * 255 + 0.5;
    out[i] = v <= 0 ? 0 : v >= 255 ? 255 : v | 0;
  }
  return out;
}

/** A row-major sample array of any of the kinds the rasters and masks use. */
type Samples = Uint8Array | Float32Array;

/** The w × h rectangle at (x0, y0) of the row-major image `src` (width W), copied into `dst` (w × h); returns dst. */
export function cropRect<T extends Samples>(src: T, W: number, x0: number, y0: number, w: number, h: number, dst: T): T {
  for (let y = 0; y < h; y++) dst.set(src.subarray((y0 + y) * W + x0, (y0 + y) * W + x0 + w), y * w);
  return dst;
}

/** The w × h row-major `src` copied into the image `dst` (width W) at (x0, y0): the inverse of {@link cropRect}. */
export function pasteRect<T extends Samples>(src: T, w: number, h: number, dst: T, W: number, x0: number, y0: number): void {
  for (let y = 0; y < h; y++) dst.set(src.subarray(y * w, (y + 1) * w), (y0 + y) * W + x0);
}
