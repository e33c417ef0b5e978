/**
 * Stage 2, locate the specimen: the silhouette of the part on the working copy (segment/specimen.ts),
 * then the search for the fracture surface's own edge among the closed edges around the rough core
 * (segment/fractureEdge.ts: a visible notch flank, a shadow or a holder can make the silhouette
 * larger than the fracture surface), then the outer edge to sub-pixel precision along rays on the
 * full-resolution image (segment/outerEdge.ts `refineOuterEdge`).
 *
 * When the chosen edge follows the silhouette (the usual tidy picture) the silhouette's outline is
 * used as before; otherwise the outline is the chosen edge. Every edge considered is reported in
 * `edgeSearch` with its role and a note.
 */
import { warn, type Warning } from '../../warnings.js';
import type { Scale } from '../../calibrate/index.js';
import type { BoxPx, PointPx } from '../../image/geometry.js';
import { findSpecimen, refineOuterEdge, type Specimen } from '../../segment/index.js';
import { findFractureEdge, polygonMask, type FractureEdge } from '../../segment/fractureEdge.js';
import { silhouetteIsClean } from '../../segment/specimen.js';
import type { Ring } from '../../segment/rings.js';
import { fitCircle, fitEllipseToPoints } from '../../segment/fit.js';
import { polygonArea } from '../../measure/geometry.js';
import { round } from '../precision.js';
import type { WorkingFrame } from '../frame.js';
import type { EdgeCandidate, EdgeSearch } from '../result.js';

/** Input of {@link locateSpecimen}. */
export interface LocateInput {
  frame: WorkingFrame;
  scale: Scale;
  /** Rays of the measurement; the outer edge is refined on at least 360. */
  nRays: number;
  /** Net-section diameter from the user, µm (a prior for the edge choice and a scale cross-check). */
  sectionDiameterUm?: number;
  /** The specimen to outline when the image holds several (working px; segment/specimen.ts `listSpecimens`). */
  target?: BoxPx;
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

/** Fraction of the ring's points within `tol` px (along the ray) of the silhouette's edge. */
function followsSilhouette(ring: Ring, center: PointPx, sil: Specimen, tol: number): number {
  const m = sil.mask;
  const at = (x: number, y: number): number => {
    const xi = Math.round(x);
    const yi = Math.round(y);
    return xi < 0 || yi < 0 || xi >= m.width || yi >= m.height ? 0 : m.data[yi * m.width + xi];
  };
  let ok = 0;
  for (const q of ring.points) {
    const dx = q.x - center.x;
    const dy = q.y - center.y;
    const d = Math.hypot(dx, dy) || 1;
    const ux = dx / d;
    const uy = dy / d;
    if (at(q.x - tol * ux, q.y - tol * uy) !== at(q.x + tol * ux, q.y + tol * uy)) ok++;
  }
  return ring.points.length ? ok / ring.points.length : 0;
}

/** A Specimen (working px) from a ring: its polygon, mask and fits. */
function specimenFromRing(ring: Ring, sil: Specimen, width: number, height: number): Specimen | null {
  const onFrame = (p: PointPx): boolean => p.x <= 0 || p.y <= 0 || p.x >= width - 1 || p.y >= height - 1;
  const poly = ring.points.map((p) => ({ x: Math.min(width - 1, Math.max(0, p.x)), y: Math.min(height - 1, Math.max(0, p.y)) }));
  const inner = poly.filter((p) => !onFrame(p));
  const circle = fitCircle(inner);
  const ellipse = fitEllipseToPoints(inner);
  if (!circle || !ellipse || inner.length < 16) return null;
  const mask = polygonMask(poly, width, height);
  const area = polygonArea(poly);
  const frameContactFraction = 1 - inner.length / poly.length;
  return {
    mask, contour: poly, circle, ellipse, areaPx: area, equivalentRadiusPx: Math.sqrt(area / Math.PI),
    background: sil.background, touchesFrame: frameContactFraction > 0, frameContactFraction, thresholdLevel: sil.thresholdLevel,
  };
}

function edgeSearchResult(fe: FractureEdge, frame: WorkingFrame, umPerPx: number, fromSilhouette: boolean): EdgeSearch {
  const k = frame.lengthToFull(1);
  const candidates: EdgeCandidate[] = fe.rings.map((v) => {
    const pts = v.ring.points;
    const mean = pts.reduce((s, q) => s + Math.hypot(q.x - fe.center.x, q.y - fe.center.y), 0) / pts.length;
    const outline: PointPx[] = [];
    for (let i = 0; i < 72; i++) {
      const q = frame.toFull(pts[Math.round((i * pts.length) / 72) % pts.length]);
      outline.push({ x: round(q.x, 2), y: round(q.y, 2) });
    }
    const c = frame.toFull(fe.center);
    const diameterPx = round(2 * mean * k, 2);
    return {
      diameterPx,
      diameterUm: round(diameterPx * umPerPx, 1),
      center: { x: round(c.x, 2), y: round(c.y, 2) },
      prominence: round(v.ring.prominence, 3),
      coverage: round(v.ring.coverage, 3),
      roundnessPx: round(Number.isFinite(v.ring.roundnessPx) ? v.ring.roundnessPx * k : 1e6, 2),
      role: v.role,
      note: v.note,
      outline,
    };
  });
  return { rule: fe.chosen ? fe.rule : 'silhouette (no closed edge chosen)', outlineFromSilhouette: fromSilhouette, candidates };
}

/**
 * Finds the specimen outline and its sub-pixel outer edge.
 * @throws FractozoneError NO_SPECIMEN when no surface is found
 */
export function locateSpecimen(input: LocateInput): SpecimenLocation {
  const { frame, scale } = input;
  const silhouette = findSpecimen(frame.work, { excludeBoxes: frame.workMarks, ...(input.target ? { target: input.target } : {}) });
  const k = frame.lengthToFull(1);
  const sectionRadiusPx = input.sectionDiameterUm ? input.sectionDiameterUm / 2 / scale.umPerPx / k : null;
  const fe = findFractureEdge(frame.work, { silhouette, sectionRadiusPx, target: input.target ?? null });
  const warnings: Warning[] = [];
  let specimen = silhouette;
  let fromSilhouette = true;
  if (fe.chosen) {
    const tol = Math.max(3, 0.015 * fe.chosen.radiusPx);
    // a silhouette with a bulge (noise or a holder attached on one arc: its ellipse misses it by
    // > 3 px RMS, three times the chosen edge's own roundness) gives way to the edge even where the
    // rest follows it (sem: a 7 px bulge over 60°)
    const bulged = silhouette.ellipse.rmsResidualPx > Math.max(3, 3 * fe.chosen.roundnessPx);
    const follows = followsSilhouette(fe.chosen, fe.center, silhouette, tol);
    // the chosen edge runs on a clean elliptic silhouette over half the rays or more and is bent off
    // it elsewhere, less round than the silhouette's own misfit: the same edge, bent by a shadow or a
    // dark halo beside it — the silhouette stays (invented sample fz7-V-r1e-3: +4.5 % → −0.6 %)
    const sameEdgeBent = !bulged && silhouetteIsClean(silhouette) && follows >= 0.5 && fe.chosen.roundnessPx > 1.5 * silhouette.ellipse.rmsResidualPx;
    if (!sameEdgeBent && (bulged || follows < 0.85)) {
      const s = specimenFromRing(fe.chosen, silhouette, frame.work.width, frame.work.height);
      if (s) {
        specimen = s;
        fromSilhouette = false;
      }
    }
  } else {
    warnings.push(warn('OUTLINE_FROM_SILHOUETTE', 'no closed edge was found around the rough core: the outline is the silhouette of the part, which may include a notch flank, a shadow or a holder'));
  }
  if (fe.ambiguous) warnings.push(warn('OUTLINE_AMBIGUOUS', 'another closed edge outside the one taken could also bound the fracture surface: check the outline (the candidates are in specimen.edgeSearch)'));
  if (fe.innerRoundEdge) warnings.push(warn('OUTLINE_INNER_ROUND_EDGE', 'a strong round edge lies inside the outline taken: if it is the notch root, the band width is too large'));
  const centerWork = { x: specimen.circle.cx, y: specimen.circle.cy };
  const center = frame.toFull(centerWork);
  const searchPx = fromSilhouette ? 4 : Math.max(4, 1.5 * k + 1);
  const edge = refineOuterEdge(frame.full, specimen.contour.map((q) => frame.toFull(q)), center, { nRays: Math.max(input.nRays, 360), searchPx });
  if (specimen.touchesFrame) {
    warnings.push(warn('SPECIMEN_CUT_BY_FRAME', `the specimen is cut by the image frame (${(specimen.frameContactFraction * 100).toFixed(0)} % of its outline): rays that reach the frame are not measured`));
  }
  const radiusPx = frame.lengthToFull(specimen.circle.radiusPx);
  if (input.sectionDiameterUm) {
    const dUm = (frame.lengthToFull(specimen.ellipse.semiMajorPx) + frame.lengthToFull(specimen.ellipse.semiMinorPx)) * scale.umPerPx;
    const diff = (dUm - input.sectionDiameterUm) / input.sectionDiameterUm;
    if (fe.sectionNotFound) warnings.push(warn('SECTION_DIAMETER_NOT_FOUND', `no closed edge lies within 12 % of the given section diameter (${(input.sectionDiameterUm / 1000).toFixed(3)} mm): the outline was chosen without it`));
    if (Math.abs(diff) > 0.03) warnings.push(warn('SECTION_DIAMETER_MISMATCH', `the measured diameter of the fracture surface, ${(dUm / 1000).toFixed(3)} mm, differs from the given section diameter ${(input.sectionDiameterUm / 1000).toFixed(3)} mm by ${(diff * 100).toFixed(1)} %: check the pixel size`));
  }
  return {
    specimen, centerWork, center, outer: edge.polygon, radiusPx, radiusUm: radiusPx * scale.umPerPx,
    edgeSearch: edgeSearchResult(fe, frame, scale.umPerPx, fromSilhouette), warnings,
  };
}
