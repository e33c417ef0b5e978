/**
 * The working frame: the full-resolution image and the reduced working copy on which the outline
 * and the texture are found, with the one mapping between their pixel coordinates.
 *
 * The working copy is an area-averaged reduction (OpenCV `INTER_AREA`, see texture/resample.ts)
 * to at most {@link WORKING_LONG_SIDE_PX} px on the long side; scale marks (bar, plate, label) are
 * painted out in it with the background level (segment/marks.ts), never in the full image. A
 * working pixel (i, j) covers the full-resolution point ((i + 0.5)·sx − 0.5, (j + 0.5)·sy − 0.5),
 * with sx, sy the realised factors (full width / working width, full height / working height).
 * Lengths map with the geometric mean √(sx·sy), areas with sx·sy.
 */
import type { BoxPx, PointPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import { paintOutBoxes } from '../segment/marks.js';
import { downsampleInStrips } from './stripResize.js';

/** Long side (px) of the working copy on which the outline and the texture are found. */
export const WORKING_LONG_SIDE_PX = 1200;

/** Full-resolution image, working copy and the mapping between them (see the module comment). */
export class WorkingFrame {
  /** Full-resolution px per working px requested (≥ 1): long side / {@link WORKING_LONG_SIDE_PX}. */
  readonly factor: number;
  /** Realised factors along x and y (full px per working px). */
  readonly sx: number;
  readonly sy: number;
  /** Full px per working px for lengths, √(sx·sy). */
  readonly lengthScale: number;
  /** Working copy, scale marks painted out. */
  readonly work: GrayRaster;
  /** The scale marks in working px (the outline fits leave their points out). */
  readonly workMarks: BoxPx[];

  /**
   * @param full the decoded image (0..1), full resolution
   * @param marks boxes of the scale bar, plate and label in full-resolution px (may be empty)
   * @param longSidePx long side of the working copy (default {@link WORKING_LONG_SIDE_PX})
   */
  constructor(
    readonly full: GrayRaster,
    readonly marks: readonly BoxPx[],
    longSidePx = WORKING_LONG_SIDE_PX,
  ) {
    this.factor = Math.max(1, Math.max(full.width, full.height) / longSidePx);
    const reduced = downsampleInStrips(full, this.factor); // = downsample, in strips for large images
    this.sx = full.width / reduced.width;
    this.sy = full.height / reduced.height;
    this.lengthScale = Math.sqrt(this.sx * this.sy);
    this.workMarks = marks.map((b) => this.boxToWork(b));
    this.work = marks.length ? paintOutBoxes(reduced, this.workMarks) : reduced;
  }

  /** Working px → full-resolution px. */
  toFull(q: PointPx): PointPx {
    return { x: (q.x + 0.5) * this.sx - 0.5, y: (q.y + 0.5) * this.sy - 0.5 };
  }

  /** Full-resolution px → working px. */
  toWork(q: PointPx): PointPx {
    return { x: (q.x + 0.5) / this.sx - 0.5, y: (q.y + 0.5) / this.sy - 0.5 };
  }

  /** A full-resolution box in working px. */
  boxToWork(b: BoxPx): BoxPx {
    return { x: (b.x + 0.5) / this.sx - 0.5, y: (b.y + 0.5) / this.sy - 0.5, w: b.w / this.sx, h: b.h / this.sy };
  }

  /** A length in working px → full-resolution px. */
  lengthToFull(px: number): number {
    return px * this.lengthScale;
  }

  /** An area in working px² → full-resolution px². */
  areaToFull(px2: number): number {
    return px2 * this.sx * this.sy;
  }

  /** Full-resolution image size, px. */
  get fullSize(): { width: number; height: number } {
    return { width: this.full.width, height: this.full.height };
  }
}
