/**
 * Scale-bar layout and burning. Convention shared with the scale-bar detector: the bar is
 * horizontal, covers pixel columns x0..x1 inclusive on rows y0..y1; its drawn length is
 * round(lengthUm / umPerPxX) = x1 − x0 + 1 px (edge to edge); the midline runs between the pixel
 * centres (x0, y) and (x1, y) with y = (y0 + y1) / 2.
 */
import { rectCoverage, textCoverage } from '../draw/coverage.js';
import { measureText } from '../draw/font.js';
import { paintGray } from '../draw/paint.js';
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import type { ScaleBarOptions } from './options.js';

/** A pixel box, inclusive corners. */
export interface BoxPx {
  readonly x0: number;
  readonly y0: number;
  readonly x1: number;
  readonly y1: number;
}

/** Where the scale bar went (all px). */
export interface ScaleBarTruth {
  readonly x0: number;
  readonly x1: number;
  readonly y0: number;
  readonly y1: number;
  /** midline row, (y0 + y1) / 2 */
  readonly y: number;
  readonly lengthPx: number;
  readonly lengthUm: number;
  readonly thicknessPx: number;
  readonly polarity: 'light' | 'dark';
  readonly label: string | null;
  readonly labelBox: BoxPx | null;
  readonly plateBox: BoxPx | null;
  /** bar intensity (0..1) and plate intensity (null without plate) */
  readonly barValue: number;
  readonly plateValue: number | null;
}

/** Automatic label: "500 µm", "1 mm", "2.5 mm". */
export function autoBarLabel(lengthUm: number): string {
  if (lengthUm >= 1000) return `${Number((lengthUm / 1000).toPrecision(6))} mm`;
  return `${Number(lengthUm.toPrecision(6))} \u00b5m`;
}

/** Compute the layout of bar, label and plate in a W×H frame. */
export function layoutScaleBar(b: ScaleBarOptions, W: number, H: number, umPerPxX: number): ScaleBarTruth {
  const lengthPx = Math.round(b.lengthUm / umPerPxX);
  if (lengthPx < 2) throw new FractozoneError('BAD_PARAMETER', `scale bar of ${b.lengthUm} µm would be shorter than 2 px at ${umPerPxX} µm/px`);
  const label = b.label === null ? autoBarLabel(b.lengthUm) : b.label === '' ? null : b.label;
  const scale = b.labelScale > 0 ? b.labelScale : Math.max(1, Math.round(Math.min(W, H) / 300));
  const ts = label ? measureText(label, scale) : { width: 0, height: 0 };
  const gap = label ? Math.max(2, Math.round(b.thicknessPx * 0.8)) : 0;
  const pad = b.plate ? Math.max(3, Math.round(b.thicknessPx * 0.8)) : 0;
  const blockW = Math.max(lengthPx, ts.width);
  const blockH = ts.height + gap + b.thicknessPx;
  let bx0: number;
  let by0: number;
  if (b.positionPx) {
    bx0 = b.positionPx.x0;
    by0 = b.positionPx.y0 - ts.height - gap; // label above the bar
    if (by0 < 0) by0 = b.positionPx.y0; // no room: bar at y0 (label placed below it)
  } else {
    const margin = Math.max(4, Math.round(Math.min(W, H) * 0.025)) + pad;
    bx0 = b.corner === 'tl' || b.corner === 'bl' ? margin : W - margin - blockW;
    by0 = b.corner === 'tl' || b.corner === 'tr' ? margin : H - margin - blockH;
  }
  let x0: number;
  let y0: number;
  let labelBox: BoxPx | null = null;
  if (b.positionPx) {
    x0 = b.positionPx.x0;
    y0 = b.positionPx.y0;
    if (label) {
      const lx = Math.round(x0 + (lengthPx - ts.width) / 2);
      const above = by0 < y0;
      const ly = above ? y0 - gap - ts.height : y0 + b.thicknessPx + gap;
      labelBox = { x0: lx, y0: ly, x1: lx + ts.width - 1, y1: ly + ts.height - 1 };
    }
  } else {
    x0 = bx0 + Math.floor((blockW - lengthPx) / 2);
    y0 = by0 + ts.height + gap;
    if (label) {
      const lx = bx0 + Math.floor((blockW - ts.width) / 2);
      labelBox = { x0: lx, y0: by0, x1: lx + ts.width - 1, y1: by0 + ts.height - 1 };
    }
  }
  const x1 = x0 + lengthPx - 1;
  const y1 = y0 + b.thicknessPx - 1;
  if (x0 < 0 || y0 < 0 || x1 >= W || y1 >= H) {
    throw new FractozoneError('BAD_PARAMETER', `scale bar of ${b.lengthUm} µm (${lengthPx} px) does not fit in the ${W}×${H} px image`);
  }
  let plateBox: BoxPx | null = null;
  if (b.plate) {
    const ux0 = Math.min(x0, labelBox ? labelBox.x0 : x0);
    const uy0 = Math.min(y0, labelBox ? labelBox.y0 : y0);
    const ux1 = Math.max(x1, labelBox ? labelBox.x1 : x1);
    const uy1 = Math.max(y1, labelBox ? labelBox.y1 : y1);
    plateBox = { x0: Math.max(0, ux0 - pad), y0: Math.max(0, uy0 - pad), x1: Math.min(W - 1, ux1 + pad), y1: Math.min(H - 1, uy1 + pad) };
  }
  const barValue = b.polarity === 'light' ? 0.96 : 0.04;
  return {
    x0,
    x1,
    y0,
    y1,
    y: (y0 + y1) / 2,
    lengthPx,
    lengthUm: b.lengthUm,
    thicknessPx: b.thicknessPx,
    polarity: b.polarity,
    label,
    labelBox,
    plateBox,
    barValue,
    plateValue: b.plate ? 1 - barValue : null,
  };
}

/** Burn plate, bar and label into the raster (opaque, not anti-aliased). */
export function burnScaleBar(r: GrayRaster, t: ScaleBarTruth, labelScale: number): void {
  if (t.plateBox && t.plateValue !== null) {
    paintGray(r, rectCoverage(r.width, r.height, t.plateBox.x0, t.plateBox.y0, t.plateBox.x1, t.plateBox.y1), { gray: t.plateValue });
  }
  paintGray(r, rectCoverage(r.width, r.height, t.x0, t.y0, t.x1, t.y1), { gray: t.barValue });
  if (t.label && t.labelBox) {
    paintGray(r, textCoverage(r.width, r.height, t.label, t.labelBox.x0, t.labelBox.y0, labelScale), { gray: t.barValue });
  }
}

/** Label scale used by the layout (exported so the burner uses the same one). */
export function labelScaleFor(b: ScaleBarOptions, W: number, H: number): number {
  return b.labelScale > 0 ? b.labelScale : Math.max(1, Math.round(Math.min(W, H) / 300));
}
