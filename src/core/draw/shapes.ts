/**
 * Convenience drawing functions: build a shape's coverage and paint it in one call, on an RGBA
 * image or a gray raster. All coordinates in image pixels (pixel centres at integers).
 */
import type { GrayRaster } from '../image/raster.js';
import { circleCoverage, discCoverage, ellipseCoverage, lineCoverage, polylineCoverage, rectCoverage, textCoverage } from './coverage.js';
import { paint } from './paint.js';
import type { Ink, PointPx, RgbaImage } from './types.js';

type Target = RgbaImage | GrayRaster;

/** Fill pixel columns x0..x1 and rows y0..y1 (inclusive) with `ink`. */
export function fillRect(t: Target, x0: number, y0: number, x1: number, y1: number, ink: Ink): void {
  paint(t, rectCoverage(t.width, t.height, x0, y0, x1, y1), ink);
}

/** Anti-aliased line of width `widthPx` px from (ax, ay) to (bx, by). */
export function drawLine(t: Target, ax: number, ay: number, bx: number, by: number, widthPx: number, ink: Ink): void {
  paint(t, lineCoverage(t.width, t.height, ax, ay, bx, by, widthPx), ink);
}

/** Anti-aliased polyline of width `widthPx` px; `closed` joins the ends. */
export function drawPolyline(t: Target, points: readonly PointPx[], widthPx: number, ink: Ink, closed = false): void {
  paint(t, polylineCoverage(t.width, t.height, points, widthPx, closed), ink);
}

/** Anti-aliased circle outline, radius and width in px. */
export function drawCircle(t: Target, cx: number, cy: number, radiusPx: number, widthPx: number, ink: Ink): void {
  paint(t, circleCoverage(t.width, t.height, cx, cy, radiusPx, widthPx), ink);
}

/** Anti-aliased filled disc, radius in px. */
export function fillDisc(t: Target, cx: number, cy: number, radiusPx: number, ink: Ink): void {
  paint(t, discCoverage(t.width, t.height, cx, cy, radiusPx), ink);
}

/** Anti-aliased ellipse outline; semi-axis a along angleDeg (0° = +x, CCW on screen), px. */
export function drawEllipse(t: Target, cx: number, cy: number, a: number, b: number, angleDeg: number, widthPx: number, ink: Ink): void {
  paint(t, ellipseCoverage(t.width, t.height, cx, cy, a, b, angleDeg, widthPx), ink);
}

/** Text in the 5×7 bitmap font; (x, y) is the top-left corner, `scale` an integer factor. */
export function drawText(t: Target, text: string, x: number, y: number, scale: number, ink: Ink): void {
  paint(t, textCoverage(t.width, t.height, text, x, y, scale), ink);
}
