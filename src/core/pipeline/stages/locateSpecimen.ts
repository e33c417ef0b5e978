/**
 * Stage 2, locate the specimen: the outline on the working copy (Otsu, texture, holes filled, the
 * component at the centre; segment/specimen.ts), then the outer edge to sub-pixel precision along
 * rays on the full-resolution image (segment/refine.ts `refineOuterEdge`).
 */
import { warn, type Warning } from '../../warnings.js';
import type { Scale } from '../../calibrate/index.js';
import type { PointPx } from '../../image/geometry.js';
import { findSpecimen, refineOuterEdge, type Specimen } from '../../segment/index.js';
import type { WorkingFrame } from '../frame.js';
import type { EdgeSearch } from '../result.js';

/** Input of {@link locateSpecimen}. */
export interface LocateInput {
  frame: WorkingFrame;
  scale: Scale;
  /** Rays of the measurement; the outer edge is refined on at least 360. */
  nRays: number;
}

/** Output of {@link locateSpecimen}. */
export interface SpecimenLocation {
  /** Outline, mask and fits in working px. */
  specimen: Specimen;
  /** Fitted circle centre in working px and in full-resolution px. */
  centerWork: PointPx;
  center: PointPx;
  /** Sub-pixel outer edge, one vertex per ray, full-resolution px. */
  outer: PointPx[];
  /** Fitted circle radius, full-resolution px and µm. */
  radiusPx: number;
  radiusUm: number;
  /** Edges considered for the outline and the rule that chose (absent: not searched). */
  edgeSearch?: EdgeSearch | null;
  warnings: Warning[];
}

/**
 * Finds the specimen outline and its sub-pixel outer edge.
 * @throws FractozoneError NO_SPECIMEN when no surface is found
 */
export function locateSpecimen(input: LocateInput): SpecimenLocation {
  const { frame, scale } = input;
  const specimen = findSpecimen(frame.work, { excludeBoxes: frame.workMarks });
  const centerWork = { x: specimen.circle.cx, y: specimen.circle.cy };
  const center = frame.toFull(centerWork);
  const edge = refineOuterEdge(frame.full, specimen.contour.map((q) => frame.toFull(q)), center, { nRays: Math.max(input.nRays, 360) });
  const warnings: Warning[] = [];
  if (specimen.touchesFrame) {
    warnings.push(warn('SPECIMEN_CUT_BY_FRAME', `the specimen is cut by the image frame (${(specimen.frameContactFraction * 100).toFixed(0)} % of its outline): rays that reach the frame are not measured`));
  }
  const radiusPx = frame.lengthToFull(specimen.circle.radiusPx);
  return { specimen, centerWork, center, outer: edge.polygon, radiusPx, radiusUm: radiusPx * scale.umPerPx, warnings };
}
