/**
 * Scale marks (a detected scale bar, its plate and its label) are not part of the fracture
 * surface. A bright plate on a dark background that touches the specimen would otherwise merge
 * with it and bend the outline. Before the outline is found their boxes are painted with the
 * background level, and rays whose outer edge ends in such a box are not measured
 * (measureBand's `markBoxes`).
 */
import type { ScaleBar } from '../calibrate/scaleBar.js';
import type { BoxPx } from '../image/geometry.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { inBoxes } from '../measure/geometry.js';

/** Margin added around every mark box, px (anti-aliased edges, blur). */
export const MARK_PAD_PX = 3;

/**
 * Boxes of a detected bar, its plate and label, each padded by {@link MARK_PAD_PX} and clipped to
 * the image (full-resolution px, pixel centres at integers: a box covers x ∈ [x, x + w]). With a
 * raster, a plate box is first grown side by side while the next row or column outside it still
 * has the plate's level (the detector's plate box can miss a strip, e.g. above the label).
 */
export function scaleMarkBoxes(bar: ScaleBar, width: number, height: number, r?: GrayRaster): BoxPx[] {
  const h = bar.thicknessPx / 2 + 0.5;
  const boxes: BoxPx[] = [
    {
      x: Math.min(bar.x0, bar.x1) - h,
      y: Math.min(bar.y0, bar.y1) - h,
      w: Math.abs(bar.x1 - bar.x0) + 2 * h,
      h: Math.abs(bar.y1 - bar.y0) + 2 * h,
    },
  ];
  if (bar.plate) boxes.push(r ? growPlate(r, bar.plate, bar.thicknessPx) : bar.plate);
  if (bar.labelBox) boxes.push(bar.labelBox);
  const out: BoxPx[] = [];
  for (const b of boxes) {
    const x0 = Math.max(0, b.x - MARK_PAD_PX);
    const y0 = Math.max(0, b.y - MARK_PAD_PX);
    const x1 = Math.min(width - 1, b.x + b.w + MARK_PAD_PX);
    const y1 = Math.min(height - 1, b.y + b.h + MARK_PAD_PX);
    if (x1 > x0 && y1 > y0) out.push({ x: x0, y: y0, w: x1 - x0, h: y1 - y0 });
  }
  return out;
}

/**
 * Grows a plate box while the median of the next row / column segment along each side is within
 * a quarter of the plate–surround contrast of the plate level (median inside the box), at most
 * max(4·bar thickness, box height) px per side.
 */
function growPlate(r: GrayRaster, box: BoxPx, barThicknessPx: number): BoxPx {
  const { width: W, height: H, data } = r;
  let x0 = Math.max(0, Math.round(box.x));
  let y0 = Math.max(0, Math.round(box.y));
  let x1 = Math.min(W - 1, Math.round(box.x + box.w));
  let y1 = Math.min(H - 1, Math.round(box.y + box.h));
  if (x1 <= x0 || y1 <= y0) return box;
  const inside: number[] = [];
  for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) inside.push(data[y * W + x]);
  inside.sort((a, b) => a - b);
  const level = inside[inside.length >> 1];
  // surround: mean of a ring 3 px outside the box
  let sum = 0;
  let n = 0;
  const ring = (x: number, y: number): void => {
    if (x >= 0 && y >= 0 && x < W && y < H) {
      sum += data[y * W + x];
      n++;
    }
  };
  for (let x = x0 - 3; x <= x1 + 3; x++) {
    ring(x, y0 - 3);
    ring(x, y1 + 3);
  }
  for (let y = y0 - 2; y <= y1 + 2; y++) {
    ring(x0 - 3, y);
    ring(x1 + 3, y);
  }
  if (n === 0) return box;
  const tol = Math.abs(level - sum / n) / 4;
  if (!(tol > 1e-3)) return box;
  const maxGrow = Math.max(4 * barThicknessPx, y1 - y0, 8);
  // medians, not means: label strokes cross many of the plate's rows
  const median = (v: number[]): number => {
    v.sort((a, b) => a - b);
    return v[v.length >> 1];
  };
  const rowMean = (y: number): number => {
    const v: number[] = [];
    for (let x = x0; x <= x1; x++) v.push(data[y * W + x]);
    return median(v);
  };
  const colMean = (x: number): number => {
    const v: number[] = [];
    for (let y = y0; y <= y1; y++) v.push(data[y * W + x]);
    return median(v);
  };
  for (let g = 0; g < maxGrow && y0 > 0 && Math.abs(rowMean(y0 - 1) - level) < tol; g++) y0--;
  for (let g = 0; g < maxGrow && y1 < H - 1 && Math.abs(rowMean(y1 + 1) - level) < tol; g++) y1++;
  for (let g = 0; g < maxGrow && x0 > 0 && Math.abs(colMean(x0 - 1) - level) < tol; g++) x0--;
  for (let g = 0; g < maxGrow && x1 < W - 1 && Math.abs(colMean(x1 + 1) - level) < tol; g++) x1++;
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

/**
 * A copy of `r` with every pixel inside the boxes set to the median of the image's frame pixels
 * that lie outside them (the background level where the marks sit, usually a margin or corner).
 */
export function paintOutBoxes(r: GrayRaster, boxes: readonly BoxPx[]): GrayRaster {
  const { width: W, height: H } = r;
  const data = new Float32Array(r.data);
  if (boxes.length === 0) return createRaster(W, H, data);
  const frame: number[] = [];
  const take = (x: number, y: number): void => {
    if (!inBoxes(boxes, x, y)) frame.push(data[y * W + x]);
  };
  for (let x = 0; x < W; x++) {
    take(x, 0);
    if (H > 1) take(x, H - 1);
  }
  for (let y = 1; y < H - 1; y++) {
    take(0, y);
    if (W > 1) take(W - 1, y);
  }
  if (frame.length === 0) return createRaster(W, H, data);
  frame.sort((a, b) => a - b);
  const level = frame[frame.length >> 1];
  for (const b of boxes) {
    const x0 = Math.max(0, Math.floor(b.x));
    const x1 = Math.min(W - 1, Math.ceil(b.x + b.w));
    const y0 = Math.max(0, Math.floor(b.y));
    const y1 = Math.min(H - 1, Math.ceil(b.y + b.h));
    for (let y = y0; y <= y1; y++) data.fill(level, y * W + x0, y * W + x1 + 1);
  }
  return createRaster(W, H, data);
}
