/**
 * The closed edges the fixed-rule edge search finds around the rough core (segment/fractureEdge.ts),
 * as candidates for the model branch's outer edge, and the centre the radiality feature is
 * measured from.
 *
 * Centre: the centre of the part's silhouette (segment/specimen.ts), unless the edge search chose a
 * closed edge whose centre lies more than 8 % of its radius away from it — a notch flank, a holder
 * or a shadow merged with the silhouette pulls the silhouette's centre off (flank-holder-tint:
 * 95–175 px on 1000 × 760 px images, the chosen edge's centre 1–2 px off); then the chosen edge's
 * centre. 8 % is the edge search's own limit for a silhouette off the voted centre.
 *
 * Choice among candidates (learn/segment.ts): each outline (the model's own RANSAC ellipse and every
 * closed edge the search counts) is scored by how well its disc agrees with the model's outside
 * probability over a common annulus around the centre — the mean of P(outside) inside the outline
 * and of 1 − P(outside) outside it, over rays and radii (lower is better). A flank the model takes
 * for the band just outside the notch root, or a patch of the band it takes for outside, then costs
 * what it covers, not where its first crossing of ½ lies. A sure choice of the edge search
 * (`sureEdge`: unambiguous, clear on ≥ 90 % of the rays, very round) is kept unless the model's
 * ellipse scores better by `SURE_EDGE_MARGIN` or is the same edge (`SAME_EDGE_SHARE`): beside a U
 * flank the model's P(outside) is itself wrong (it takes the flank for surface), so its own ellipse
 * ~20 px out scored 0.007–0.018 better than the notch root (flank-holder-tint-b: +39–81 % → −1.6 to
 * −2.8 %).
 */
import type { PointPx } from '../image/geometry.js';
import type { WorkingFrame } from '../pipeline/frame.js';
import { findFractureEdge, type FractureEdge } from '../segment/fractureEdge.js';
import { fitCircle, type EllipseFit } from '../segment/fit.js';
import { findSpecimen, type Specimen } from '../segment/specimen.js';
import { rayDirection } from '../measure/geometry.js';
import { rayToEllipse } from './outline.js';

/** Share of the chosen edge's radius by which its centre must differ from the silhouette's to be taken (see the module comment). */
export const OFF_CENTRE_SHARE = 0.08;

/** The fixed-rule outline cues of a working copy. */
export interface OutlineCues {
  /** Centre for the radiality feature, working px. */
  centre: PointPx;
  /** The edge search, or null when no silhouette was found. */
  edges: FractureEdge | null;
  silhouette: Specimen | null;
}

/** Silhouette, edge search and radiality centre of a working copy (see the module comment). */
export function outlineCues(frame: WorkingFrame): OutlineCues {
  let silhouette: Specimen;
  try {
    silhouette = findSpecimen(frame.work, { excludeBoxes: frame.workMarks });
  } catch (e) {
    if ((e as { code?: string }).code !== 'NO_SPECIMEN') throw e;
    return { centre: { x: (frame.work.width - 1) / 2, y: (frame.work.height - 1) / 2 }, edges: null, silhouette: null };
  }
  const sil = { x: silhouette.circle.cx, y: silhouette.circle.cy };
  const edges = findFractureEdge(frame.work, { silhouette, sectionRadiusPx: null });
  const ch = edges.chosen ? fitCircle(edges.chosen.points) : null;
  const centre = ch && Math.hypot(ch.cx - sil.x, ch.cy - sil.y) > OFF_CENTRE_SHARE * ch.radiusPx ? { x: ch.cx, y: ch.cy } : sil;
  return { centre, edges, silhouette };
}

/** Radius of a closed outline (points in angular order about `centre`) along each of `nRays` rays, null where none. */
export function outlineRadii(points: readonly PointPx[], centre: PointPx, nRays: number): (number | null)[] {
  const n = points.length;
  const ang = points.map((q) => Math.atan2(-(q.y - centre.y), q.x - centre.x));
  const rad = points.map((q) => Math.hypot(q.x - centre.x, q.y - centre.y));
  const out: (number | null)[] = new Array(nRays).fill(null);
  // each segment of the closed polygon sets the rays whose angle it spans (nearest crossing kept: outermost)
  for (let k = 0; k < n; k++) {
    const a0 = ang[k];
    let a1 = ang[(k + 1) % n];
    let d = a1 - a0;
    if (d > Math.PI) d -= 2 * Math.PI;
    if (d < -Math.PI) d += 2 * Math.PI;
    if (Math.abs(d) < 1e-12) continue;
    a1 = a0 + d;
    const lo = Math.min(a0, a1);
    const hi = Math.max(a0, a1);
    const step = (2 * Math.PI) / nRays;
    for (let i = Math.ceil(lo / step); i * step <= hi; i++) {
      const f = (i * step - a0) / d;
      const r = rad[k] + f * (rad[(k + 1) % n] - rad[k]);
      const j = ((i % nRays) + nRays) % nRays;
      const cur = out[j];
      if (cur === null || r > cur) out[j] = r;
    }
  }
  return out;
}

/** Radius of an ellipse along each ray from `centre`. */
export function ellipseRadii(e: EllipseFit, centre: PointPx, nRays: number): (number | null)[] {
  return Array.from({ length: nRays }, (_, i) => rayToEllipse(e, centre, rayDirection((360 * i) / nRays)));
}

/**
 * Disagreement of outlines with the outside probability (see the module comment): for each outline
 * (radius per ray about `centre`), the mean over rays and radii rMin..rMax (0.5 px steps, points in
 * the image only, rays where an outline has no radius left out for all) of P(outside) inside it and
 * 1 − P(outside) outside it. Lower is better; 0 = the disc is exactly the surface the model sees.
 */
export function outlineDisagreement(outside: Float32Array, W: number, H: number, centre: PointPx, outlines: readonly (number | null)[][], rMin: number, rMax: number): number[] {
  const nRays = outlines[0]?.length ?? 0;
  const s = new Float64Array(outlines.length);
  let n = 0;
  for (let i = 0; i < nRays; i++) {
    if (outlines.some((o) => o[i] === null)) continue;
    const d = rayDirection((360 * i) / nRays);
    for (let t = rMin; t <= rMax; t += 0.5) {
      const x = centre.x + t * d.x;
      const y = centre.y + t * d.y;
      if (x < 0 || y < 0 || x > W - 1 || y > H - 1) break;
      const v = outside[Math.round(y) * W + Math.round(x)];
      n++;
      for (let c = 0; c < outlines.length; c++) s[c] += t < (outlines[c][i] as number) ? v : 1 - v;
    }
  }
  return Array.from(s, (v) => (n ? v / n : 1));
}

/**
 * Margin of disagreement (`outlineDisagreement`) by which the model's ellipse must beat a sure
 * choice of the edge search to replace it (our choice, measured: 0.007–0.018 on flank-holder-tint-b
 * where the model is wrong; see DEVELOPERS.md "Pixel classifier").
 */
export const SURE_EDGE_MARGIN = 0.03;

/**
 * Two outlines whose radii differ by at most this share of the radius (mean over rays) are the same
 * edge: then the model's ellipse keeps its place (its crossing of P(outside), placed on the intensity
 * step, as before). Measured: 0.1–0.3 px apart on the tint-blue and SEM series (r ≈ 294 px), 20–29 px
 * on flank-holder-tint-b (r ≈ 227 px). Our choice.
 */
export const SAME_EDGE_SHARE = 0.02;

/** Mean over rays (where both have one) of the difference of two outlines' radii, px. */
export function outlinesApart(a: (number | null)[], b: (number | null)[]): number {
  let s = 0;
  let n = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (x === null || y === null) continue;
    s += Math.abs(x - y);
    n++;
  }
  return n ? s / n : 0;
}

/**
 * The edge search's choice is sure: not ambiguous (OUTLINE_AMBIGUOUS), not bent by a shadow, the
 * chosen ring clear on ≥ 90 % of the rays and very round (RMS ≤ 1.5 px, the edge search's own limit
 * of "very round" in segment/fractureEdge.ts).
 */
export function sureEdge(e: FractureEdge): boolean {
  const c = e.chosen;
  return !!c && !e.ambiguous && !e.bent && c.coverage >= 0.9 && c.roundnessPx <= 1.5;
}
