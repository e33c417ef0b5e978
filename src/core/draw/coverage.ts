/**
 * Shape coverage builders: each returns a {@link Coverage} (anti-aliased fraction covered per pixel)
 * limited to the shape's bounding box and to the canvas. Painting is separate (see paint.ts), so the
 * same shape can be burned into an RGBA image or a gray raster.
 *
 * Anti-aliasing uses the distance from the pixel centre to the shape's centre line:
 * coverage = clamp(w/2 + 1/2 − d, 0, 1) — a one-pixel linear ramp ("signed-distance
 * anti-aliasing", common practice, no source).
 */
import { FractozoneError } from '../errors.js';
import { GLYPH_ADVANCE, GLYPH_HEIGHT, GLYPH_WIDTH, glyphBitmap } from './font.js';
import type { Coverage, PointPx } from './types.js';

function emptyCoverage(): Coverage {
  return { x0: 0, y0: 0, width: 0, height: 0, data: new Float32Array(0) };
}

function box(canvasW: number, canvasH: number, xa: number, ya: number, xb: number, yb: number): Coverage {
  const x0 = Math.max(0, Math.floor(xa));
  const y0 = Math.max(0, Math.floor(ya));
  const x1 = Math.min(canvasW - 1, Math.ceil(xb));
  const y1 = Math.min(canvasH - 1, Math.ceil(yb));
  if (x1 < x0 || y1 < y0) return emptyCoverage();
  const width = x1 - x0 + 1;
  const height = y1 - y0 + 1;
  return { x0, y0, width, height, data: new Float32Array(width * height) };
}

function checkFinite(what: string, ...v: number[]): void {
  for (const x of v) {
    if (!Number.isFinite(x)) throw new FractozoneError('BAD_PARAMETER', `${what}: coordinates and sizes must be finite numbers`);
  }
}

/**
 * Filled axis-aligned rectangle covering whole pixel columns x0..x1 and rows y0..y1 (inclusive,
 * integer pixel indices; no anti-aliasing, so it is exact for scale bars).
 * @param canvasW canvas width in px
 * @param canvasH canvas height in px
 */
export function rectCoverage(canvasW: number, canvasH: number, x0: number, y0: number, x1: number, y1: number): Coverage {
  checkFinite('rectangle', x0, y0, x1, y1);
  const c = box(canvasW, canvasH, Math.round(Math.min(x0, x1)), Math.round(Math.min(y0, y1)), Math.round(Math.max(x0, x1)), Math.round(Math.max(y0, y1)));
  c.data.fill(1);
  return c;
}

function segmentInto(c: Coverage, ax: number, ay: number, bx: number, by: number, half: number): void {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const reach = half + 1;
  const xs = Math.max(c.x0, Math.floor(Math.min(ax, bx) - reach));
  const xe = Math.min(c.x0 + c.width - 1, Math.ceil(Math.max(ax, bx) + reach));
  const ys = Math.max(c.y0, Math.floor(Math.min(ay, by) - reach));
  const ye = Math.min(c.y0 + c.height - 1, Math.ceil(Math.max(ay, by) + reach));
  const d = c.data;
  for (let y = ys; y <= ye; y++) {
    const row = (y - c.y0) * c.width - c.x0;
    for (let x = xs; x <= xe; x++) {
      let t = len2 > 0 ? ((x - ax) * dx + (y - ay) * dy) / len2 : 0;
      t = t < 0 ? 0 : t > 1 ? 1 : t;
      const ex = x - (ax + t * dx);
      const ey = y - (ay + t * dy);
      const dist = Math.sqrt(ex * ex + ey * ey);
      let v = half + 0.5 - dist;
      if (v <= 0) continue;
      if (v > 1) v = 1;
      const i = row + x;
      if (v > d[i]) d[i] = v;
    }
  }
}

/**
 * Anti-aliased straight line with round caps.
 * @param widthPx stroke width in px (> 0)
 */
export function lineCoverage(canvasW: number, canvasH: number, ax: number, ay: number, bx: number, by: number, widthPx = 1): Coverage {
  return polylineCoverage(canvasW, canvasH, [{ x: ax, y: ay }, { x: bx, y: by }], widthPx, false);
}

/**
 * Anti-aliased polyline (round joins); joins are not double-painted because segment coverages are
 * combined with max.
 * @param points vertices in px
 * @param widthPx stroke width in px (> 0)
 * @param closed join the last vertex back to the first
 */
export function polylineCoverage(canvasW: number, canvasH: number, points: readonly PointPx[], widthPx = 1, closed = false): Coverage {
  if (!(widthPx > 0) || !Number.isFinite(widthPx)) throw new FractozoneError('BAD_PARAMETER', `line width must be a positive number of pixels, got ${widthPx}`);
  if (points.length === 0) return emptyCoverage();
  let xmin = Infinity;
  let ymin = Infinity;
  let xmax = -Infinity;
  let ymax = -Infinity;
  for (const p of points) {
    checkFinite('polyline', p.x, p.y);
    if (p.x < xmin) xmin = p.x;
    if (p.x > xmax) xmax = p.x;
    if (p.y < ymin) ymin = p.y;
    if (p.y > ymax) ymax = p.y;
  }
  const half = widthPx / 2;
  const c = box(canvasW, canvasH, xmin - half - 1, ymin - half - 1, xmax + half + 1, ymax + half + 1);
  if (c.width === 0) return c;
  const n = points.length;
  if (n === 1) segmentInto(c, points[0].x, points[0].y, points[0].x, points[0].y, half);
  for (let i = 0; i + 1 < n; i++) segmentInto(c, points[i].x, points[i].y, points[i + 1].x, points[i + 1].y, half);
  if (closed && n > 2) segmentInto(c, points[n - 1].x, points[n - 1].y, points[0].x, points[0].y, half);
  return c;
}

/**
 * Anti-aliased circle outline.
 * @param cx centre x in px
 * @param cy centre y in px
 * @param radiusPx radius of the stroke's centre line in px
 * @param widthPx stroke width in px
 */
export function circleCoverage(canvasW: number, canvasH: number, cx: number, cy: number, radiusPx: number, widthPx = 1): Coverage {
  return ellipseCoverage(canvasW, canvasH, cx, cy, radiusPx, radiusPx, 0, widthPx);
}

/**
 * Anti-aliased filled disc (edge ramp of one pixel centred on the radius).
 */
export function discCoverage(canvasW: number, canvasH: number, cx: number, cy: number, radiusPx: number): Coverage {
  checkFinite('disc', cx, cy, radiusPx);
  const c = box(canvasW, canvasH, cx - radiusPx - 1, cy - radiusPx - 1, cx + radiusPx + 1, cy + radiusPx + 1);
  for (let y = c.y0; y < c.y0 + c.height; y++) {
    for (let x = c.x0; x < c.x0 + c.width; x++) {
      const d = Math.hypot(x - cx, y - cy);
      const v = radiusPx + 0.5 - d;
      c.data[(y - c.y0) * c.width + (x - c.x0)] = v <= 0 ? 0 : v >= 1 ? 1 : v;
    }
  }
  return c;
}

/**
 * Anti-aliased ellipse outline. The distance to the ellipse is approximated to first order,
 * d ≈ |f| / |∇f| with f = (x'/a)² + (y'/b)² − 1 (a standard implicit-curve estimate; exact for a circle).
 * @param a semi-axis along the direction angleDeg, px
 * @param b the other semi-axis, px
 * @param angleDeg direction of semi-axis a, degrees, 0° = +x, counter-clockwise on screen
 * @param widthPx stroke width in px
 */
export function ellipseCoverage(canvasW: number, canvasH: number, cx: number, cy: number, a: number, b: number, angleDeg: number, widthPx = 1): Coverage {
  checkFinite('ellipse', cx, cy, a, b, angleDeg, widthPx);
  if (!(a > 0 && b > 0)) throw new FractozoneError('BAD_PARAMETER', `ellipse semi-axes must be positive, got ${a} and ${b} px`);
  if (!(widthPx > 0)) throw new FractozoneError('BAD_PARAMETER', `line width must be a positive number of pixels, got ${widthPx}`);
  const half = widthPx / 2;
  const m = Math.max(a, b) + half + 1;
  const c = box(canvasW, canvasH, cx - m, cy - m, cx + m, cy + m);
  const t = (angleDeg * Math.PI) / 180;
  const ca = Math.cos(t);
  const sa = Math.sin(t);
  const ia2 = 1 / (a * a);
  const ib2 = 1 / (b * b);
  for (let y = c.y0; y < c.y0 + c.height; y++) {
    const dy = y - cy;
    for (let x = c.x0; x < c.x0 + c.width; x++) {
      const dx = x - cx;
      // rotate into the ellipse frame; screen y is down, so the on-screen CCW angle flips the sign
      const xp = dx * ca - dy * sa;
      const yp = dx * sa + dy * ca;
      const f = xp * xp * ia2 + yp * yp * ib2 - 1;
      const gx = 2 * xp * ia2;
      const gy = 2 * yp * ib2;
      const g = Math.sqrt(gx * gx + gy * gy);
      const dist = g > 0 ? Math.abs(f) / g : Math.max(a, b);
      const v = half + 0.5 - dist;
      c.data[(y - c.y0) * c.width + (x - c.x0)] = v <= 0 ? 0 : v >= 1 ? 1 : v;
    }
  }
  return c;
}

/**
 * Text in the built-in 5×7 bitmap font, one line, no anti-aliasing (crisp like burned-in labels).
 * @param x left edge of the first glyph, px (rounded)
 * @param y top edge of the glyphs, px (rounded)
 * @param scale integer scale factor ≥ 1
 */
export function textCoverage(canvasW: number, canvasH: number, text: string, x: number, y: number, scale = 1): Coverage {
  checkFinite('text', x, y, scale);
  const s = Math.max(1, Math.round(scale));
  const chars = Array.from(text);
  if (chars.length === 0) return emptyCoverage();
  const X = Math.round(x);
  const Y = Math.round(y);
  const w = (chars.length * GLYPH_ADVANCE - 1) * s;
  const c = box(canvasW, canvasH, X, Y, X + w - 1, Y + GLYPH_HEIGHT * s - 1);
  if (c.width === 0) return c;
  chars.forEach((ch, k) => {
    const g = glyphBitmap(ch);
    const gx0 = X + k * GLYPH_ADVANCE * s;
    for (let r = 0; r < GLYPH_HEIGHT; r++) {
      for (let q = 0; q < GLYPH_WIDTH; q++) {
        if (!g[r * GLYPH_WIDTH + q]) continue;
        for (let yy = Y + r * s; yy < Y + (r + 1) * s; yy++) {
          if (yy < c.y0 || yy >= c.y0 + c.height) continue;
          for (let xx = gx0 + q * s; xx < gx0 + (q + 1) * s; xx++) {
            if (xx < c.x0 || xx >= c.x0 + c.width) continue;
            c.data[(yy - c.y0) * c.width + (xx - c.x0)] = 1;
          }
        }
      }
    }
  });
  return c;
}
