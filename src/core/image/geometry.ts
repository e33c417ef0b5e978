/**
 * Image-coordinate geometry types used across core: a point and an axis-aligned box in pixels of
 * one image. Convention (whole project): x to the right, y down, pixel centres at integer
 * coordinates.
 */

/** A point in image pixel coordinates, px. */
export interface PointPx {
  x: number;
  y: number;
}

/** A box of pixels, inclusive bounds (px). */
export interface PixelBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** An axis-aligned box in image pixel coordinates: top-left corner (x, y) and size (w, h), px. */
export interface BoxPx {
  x: number;
  y: number;
  w: number;
  h: number;
}
