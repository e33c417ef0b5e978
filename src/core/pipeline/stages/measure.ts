/**
 * Stage 6, measure: rays from the fitted centre, the outer and boundary radius on each, the width
 * profile in µm, validity and outlier flags, and the statistics (measure/band.ts). Pure geometry
 * on the stored polygons, so `remeasure` runs exactly this stage on a saved result.
 */
import { warn, type Warning } from '../../warnings.js';
import type { BoxPx, PointPx } from '../../image/geometry.js';
import { measureBand, type BandProfile } from '../../measure/index.js';
import type { MeasureParams } from '../types.js';

/** The geometry as the result stores it (see precision.ts), px. */
export interface StoredGeometry {
  outline: PointPx[];
  boundary: PointPx[] | null;
  center: PointPx;
  /** Scale marks: rays whose outer edge ends on one are not measured. */
  marks: BoxPx[];
}

/** Input of {@link measureWidths}. */
export interface MeasureInput {
  geometry: StoredGeometry;
  /** Pixel size along x and y, µm/px. */
  umPerPx: { x: number; y: number };
  imageSize: { width: number; height: number };
  /** Widths below this many px read as "band absent" on that ray (0 = off). */
  minWidthPx: number;
  params: Pick<MeasureParams, 'nRays' | 'exclude' | 'outlierK' | 'dropOutliers' | 'seed' | 'bootstrap'>;
}

/** Output of {@link measureWidths}: the profile, or null without a boundary. */
export interface WidthMeasurement {
  profile: BandProfile | null;
  warnings: Warning[];
}

/**
 * The narrowest band an automatic boundary resolves: 0.75 texture window (full-resolution px);
 * a manual boundary is taken as drawn (0).
 */
export function minWidthPxFor(boundarySource: 'auto' | 'manual', windowPxFull: number): number {
  return boundarySource === 'auto' ? 0.75 * windowPxFull : 0;
}

/** Measures the band on the stored geometry. */
export function measureWidths(input: MeasureInput): WidthMeasurement {
  const { geometry: g, umPerPx: s, params: p } = input;
  if (!g.boundary) return { profile: null, warnings: [] };
  const profile = measureBand({
    outer: g.outline,
    boundary: g.boundary,
    center: g.center,
    umPerPx: s.x === s.y ? s.x : s,
    nRays: p.nRays,
    exclude: p.exclude,
    imageSize: input.imageSize,
    markBoxes: g.marks,
    minWidthPx: input.minWidthPx,
    outlierK: p.outlierK,
    dropOutliers: p.dropOutliers,
    seed: p.seed,
    bootstrap: p.bootstrap,
  });
  const nMark = profile.rays.filter((q) => q.reason === 'outer-edge-at-scale-mark').length;
  const warnings = nMark > 0 ? [warn('SCALE_MARK_ON_OUTLINE', `the scale bar or its plate touches the specimen outline: ${nMark} rays there are not measured`)] : [];
  return { profile, warnings };
}
