/** Drawing types shared by the primitives. */

/** 8-bit RGBA image, row-major, 4 bytes per pixel (non-premultiplied alpha). */
export interface RgbaImage {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8ClampedArray;
}

/**
 * Ink for drawing: an RGB colour (0..255 per channel) or a gray level (0..1), with an optional
 * opacity 0..1 (default 1). Gray ink on an RGBA image paints R = G = B = gray·255; RGB ink on a
 * gray raster paints its Rec. 709 luma (ITU-R BT.709 weights 0.2126, 0.7152, 0.0722).
 */
export type Ink =
  | { readonly rgb: readonly [number, number, number]; readonly alpha?: number }
  | { readonly gray: number; readonly alpha?: number };

/**
 * Anti-aliased coverage of a shape over a pixel box: `data[(y - y0) * width + (x - x0)]` in 0..1
 * is the fraction of image pixel (x, y) covered. Pixel centres are at integer coordinates.
 */
export interface Coverage {
  readonly x0: number;
  readonly y0: number;
  readonly width: number;
  readonly height: number;
  readonly data: Float32Array;
}

export type { PointPx } from '../image/geometry.js';
