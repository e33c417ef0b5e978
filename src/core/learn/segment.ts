/**
 * The model-driven branch of the measurement: a pixel classifier's probability maps take the place
 * of the fixed rules in the locate, classify and refine stages, and the same topology and the same
 * ray geometry follow.
 *
 * 1. Probabilities of outside, rim band and core on the working copy (learn/predict.ts).
 * 2. The fracture surface is where P(outside) < ½, cleaned by a closing and an opening (0.35 window),
 *    the component at the centre kept and its holes filled (the rule of segment/specimen.ts); a
 *    circle and an ellipse are fitted to its outline (points on the frame or on scale marks left
 *    out); the notch root is a RANSAC ellipse through the first exits to outside along the rays.
 *    That ellipse and every closed edge the fixed-rule edge search counts (segment/fractureEdge.ts)
 *    are scored by how well their discs agree with P(outside) (learn/edgeCandidates.ts) and the
 *    best is taken — but a sure choice of the edge search stands against the model's ellipse unless
 *    that scores better by a clear margin or is the same edge (beside a U flank the model's
 *    P(outside) is itself wrong). From the model's ellipse the outer edge along each ray is where P(outside)
 *    crosses ½ nearest it, interpolated to sub-pixel precision; from a closed edge, the edge itself.
 *    Either is then placed on the intensity step of the full image.
 * 3. The core probability q = P(core) / (P(core) + P(rim)) is the roughness signal of the existing
 *    rim/core classification (segment/rimCore.ts: Otsu split, morphology, the core as the component
 *    at the centre with its holes filled, the separability report and the refusals).
 * 4. Along each ray the model places the boundary and the image refines it: the matched step of q
 *    (`coreStep`: mean q over a window inside, mean 1 − q over a window outside, largest within
 *    1.5 windows of the classified core outline), a 5-ray running median, then the texture step of
 *    the working copy (segment/refine.ts `refineBoundary`) within one window of it. The classified
 *    core outline alone is a poor start: Otsu's split of q (per sector) takes patches of the band
 *    the model half takes for core (q ≈ 0.3) into the core, and the texture step searched from
 *    there found a step inside the band (flank-holder-tint image 2: −4.0 %) or, on the SEM look,
 *    inside the core (image 1: +3.4 %).
 * 5. Confidence: along the boundary (and the outer edge), the mean probability of the class each
 *    side should have, half a window from the line.
 */
import type { Scale } from '../calibrate/index.js';
import { FractozoneError } from '../errors.js';
import type { PointPx } from '../image/geometry.js';
import { createMask, createRaster, type Mask } from '../image/raster.js';
import { inBoxes, polygonOfRadii, rayDirection } from '../measure/geometry.js';
import type { WorkingFrame } from '../pipeline/frame.js';
import type { Classification } from '../pipeline/stages/classify.js';
import type { SpecimenLocation } from '../pipeline/stages/locateSpecimen.js';
import type { RimBoundary } from '../pipeline/stages/refineBoundary.js';
import { classifyRimCore } from '../segment/rimCore.js';
import { fillHoles, maskToMat, matToMask, morphDisc, outerContour } from '../segment/cvutil.js';
import { keepComponent } from '../segment/components.js';
import { fitCircle, fitEllipseToPoints } from '../segment/fit.js';
import { ellipseOutline, robustEllipse } from './outline.js';
import { circularMedian, refineBoundary, samplePlane } from '../segment/refine.js';
import { refineOuterEdge } from '../segment/outerEdge.js';
import type { Specimen } from '../segment/specimen.js';
import type { ResultModel } from '../pipeline/result.js';
import { warn, type Warning } from '../warnings.js';
import { windowPxAt } from './features.js';
import { ellipseRadii, outlineCues, outlineDisagreement, outlineRadii, outlinesApart, SAME_EDGE_SHARE, SURE_EDGE_MARGIN, sureEdge } from './edgeCandidates.js';
import type { FractureEdge } from '../segment/fractureEdge.js';
import type { EllipseFit } from '../segment/fit.js';
import { predictProbabilities, type ClassProbabilities, type LoadedModel } from './predict.js';
import { coreStep, crossings } from './rays.js';

/** Boundary or outer-edge confidence below which a result gets LOW_MODEL_CONFIDENCE (our own choice, no source). */
export const MIN_MODEL_CONFIDENCE = 0.75;

/** Input of {@link segmentWithModel}. */
export interface ModelSegmentInput {
  frame: WorkingFrame;
  scale: Scale;
  loaded: LoadedModel;
  /** Rays of the measurement; edges are found on at least 360. */
  nRays: number;
}

/** How sure the model is along the lines it gave (mean class probability beside them, 0..1). */
export interface ModelConfidence {
  /** Along the rim/core boundary: P(rim) outside it and P(core) inside it; null without a boundary. */
  boundary: number | null;
  /** Along the outer edge: P(outside) beyond it and P(rim) + P(core) within it. */
  outerEdge: number;
}

/** What the model branch gives the rest of the pipeline. */
export interface ModelSegmentation {
  location: SpecimenLocation;
  classification: Classification;
  boundary: RimBoundary;
  probabilities: ClassProbabilities;
  /** The middle feature window, working px (morphology, search ranges) and µm (the result's window). */
  windowPxWork: number;
  windowUm: number;
  confidence: ModelConfidence;
  warnings: Warning[];
}

/** The fracture surface: P(outside) < ½, specks removed (opening), the component at `centre`, holes filled. */
function surfaceMask(p: ClassProbabilities, windowPx: number, centre: PointPx): Mask {
  const m = createMask(p.width, p.height);
  for (let i = 0; i < m.data.length; i++) m.data[i] = p.outside[i] < 0.5 ? 1 : 0;
  const r = Math.max(1, Math.round(0.2 * windowPx));
  const mm = maskToMat(m);
  let cleaned: Mask;
  try {
    morphDisc(mm, 'open', r);
    cleaned = matToMask(mm);
  } finally {
    mm.delete();
  }
  const kept = keepComponent(cleaned, centre, 0.25);
  if (!kept) throw new FractozoneError('NO_SPECIMEN', 'the model finds no fracture surface in this image (every pixel looks like outside)');
  fillHoles(kept);
  return kept;
}

/** Specimen record (as segment/specimen.ts gives it) of a surface mask, working px. */
function specimenOf(mask: Mask, frame: WorkingFrame): Specimen {
  const W = mask.width;
  const H = mask.height;
  let area = 0;
  for (let i = 0; i < mask.data.length; i++) area += mask.data[i];
  const contour = outerContour(mask);
  const onFrame = (q: PointPx): boolean => q.x <= 0 || q.y <= 0 || q.x >= W - 1 || q.y >= H - 1;
  const inner = contour.filter((q) => !onFrame(q));
  const fitPts = frame.workMarks.length ? inner.filter((q) => !inBoxes(frame.workMarks, q.x, q.y, 2)) : inner;
  const use = fitPts.length >= Math.max(16, 0.5 * inner.length) ? fitPts : inner;
  const circle = fitCircle(use);
  const ellipse = fitEllipseToPoints(use);
  if (!circle || !ellipse) throw new FractozoneError('NO_SPECIMEN', 'the outline the model finds is too short to fit a circle or ellipse');
  const frameContactFraction = contour.length ? 1 - inner.length / contour.length : 0;
  // background brightness against the surface's, from the working copy
  let sIn = 0;
  let nIn = 0;
  let sOut = 0;
  let nOut = 0;
  for (let i = 0; i < mask.data.length; i += 7) {
    if (mask.data[i]) {
      sIn += frame.work.data[i];
      nIn++;
    } else {
      sOut += frame.work.data[i];
      nOut++;
    }
  }
  const bright = nOut > 0 && nIn > 0 && sOut / nOut > sIn / nIn;
  return {
    mask, contour, circle, ellipse, areaPx: area, equivalentRadiusPx: Math.sqrt(area / Math.PI),
    background: bright ? 'bright' : 'dark', touchesFrame: frameContactFraction > 0, frameContactFraction, thresholdLevel: 0.5,
  };
}

/** q = P(core) / (P(core) + P(rim)): the core probability within the fracture surface. */
function coreShare(p: ClassProbabilities): Float32Array {
  const q = new Float32Array(p.core.length);
  for (let i = 0; i < q.length; i++) {
    const s = p.core[i] + p.rim[i];
    q[i] = s > 1e-6 ? p.core[i] / s : 0.5;
  }
  return q;
}

/** Mean over rays of the probability of the class expected on each side of a line, `d` px from it. */
function sideConfidence(inside: Float32Array, outside: Float32Array, W: number, H: number, centre: PointPx, radii: (number | null)[], dIn: (i: number) => number, dOut: (i: number) => number): number | null {
  let s = 0;
  let n = 0;
  radii.forEach((r, i) => {
    if (r === null) return;
    const d = rayDirection((360 * i) / radii.length);
    const a = r - dIn(i);
    const b = r + dOut(i);
    s += 0.5 * (samplePlane(inside, W, H, centre.x + a * d.x, centre.y + a * d.y) + samplePlane(outside, W, H, centre.x + b * d.x, centre.y + b * d.y));
    n++;
  });
  return n ? s / n : null;
}

/**
 * Where each ray from `centre` first enters the outside class for good: P(outside) ≥ ½ over a run of
 * `run` px (px, null when it never does inside the image). On the probabilities themselves, not
 * on a hole-filled mask: a ring of the surroundings classified as surface (the outer part of a
 * notch flank) would otherwise close around the true edge.
 */
function firstExits(outside: Float32Array, W: number, H: number, centre: PointPx, nRays: number, run: number): (number | null)[] {
  const out: (number | null)[] = [];
  for (let i = 0; i < nRays; i++) {
    const d = rayDirection((360 * i) / nRays);
    let exit: number | null = null;
    let start = -1;
    for (let t = 0; ; t += 0.5) {
      const x = centre.x + t * d.x;
      const y = centre.y + t * d.y;
      if (x < 0 || y < 0 || x > W - 1 || y > H - 1) break;
      if (samplePlane(outside, W, H, x, y) >= 0.5) {
        if (start < 0) start = t;
        if (t - start >= run) {
          exit = start;
          break;
        }
      } else start = -1;
    }
    out.push(exit);
  }
  return out;
}

/** The outline chosen among the model's RANSAC ellipse and the edge search's closed edges. */
interface OutlineChoice {
  /** The chosen closed edge's points (working px), or null when the model's own ellipse is taken. */
  ring: PointPx[] | null;
  /** Disagreement of each candidate (learn/edgeCandidates.ts), the model's ellipse first. */
  scores: { source: 'model' | 'edge-search'; meanRadiusPx: number; disagreement: number }[];
}

/**
 * Scores the model's RANSAC ellipse and every closed edge the fixed-rule search counts
 * (learn/edgeCandidates.ts `outlineDisagreement`, about `centre`, radii from half the smallest to
 * 1.25 × the largest candidate) and takes the lowest; the model's ellipse keeps ties. A sure
 * choice of the edge search (`sureEdge`) is kept over the model's ellipse unless the ellipse scores
 * better by `SURE_EDGE_MARGIN` or lies within `SAME_EDGE_SHARE` of it (the same edge).
 */
function chooseOutline(p: ClassProbabilities, ellipse: EllipseFit | null, edges: FractureEdge | null, centre: PointPx, nRays: number): OutlineChoice {
  const rings = (edges?.rings ?? []).filter((v) => v.role !== 'rejected').map((v) => v.ring.points);
  const outlines = [...(ellipse ? [ellipseRadii(ellipse, centre, nRays)] : []), ...rings.map((r) => outlineRadii(r, centre, nRays))];
  if (!rings.length || !outlines.length) return { ring: null, scores: [] };
  const means = outlines.map((o) => { const v = o.filter((r): r is number => r !== null); return v.length ? v.reduce((a, b) => a + b, 0) / v.length : 0; });
  const rMin = 0.5 * Math.min(...means);
  const rMax = 1.25 * Math.max(...means);
  const dis = outlineDisagreement(p.outside, p.width, p.height, centre, outlines, rMin, rMax);
  const off = ellipse ? 1 : 0;
  let best = 0;
  for (let k = 1; k < dis.length; k++) if (dis[k] < dis[best]) best = k;
  // a sure choice of the edge search (sureEdge) stands unless the model's ellipse agrees with
  // P(outside) better by a clear margin: beside a U flank the model takes the flank for surface and
  // its own ellipse wins by 0.007–0.018 while lying ~20 px out (flank-holder-tint-b, +39–81 %)
  const sure = edges?.chosen && sureEdge(edges) ? rings.indexOf(edges.chosen.points) : -1;
  if (sure >= 0 && best < off && dis[off + sure] - dis[best] < SURE_EDGE_MARGIN && outlinesApart(outlines[best], outlines[off + sure]) > SAME_EDGE_SHARE * means[off + sure]) best = off + sure;
  const scores = dis.map((d, k) => ({ source: (k < off ? 'model' : 'edge-search') as 'model' | 'edge-search', meanRadiusPx: Math.round(means[k] * 100) / 100, disagreement: Math.round(d * 1e4) / 1e4 }));
  return { ring: best < off ? null : rings[best - off], scores };
}

/** Locate stage of the model branch: the surface, its fits and the sub-pixel outer edge. */
function locate(frame: WorkingFrame, scale: Scale, p: ClassProbabilities, w: number, centre0: PointPx, nRays: number, edges: FractureEdge | null): { location: SpecimenLocation; outerWork: (number | null)[]; choice: OutlineChoice } {
  const mask = surfaceMask(p, w, centre0);
  const base = specimenOf(mask, frame);
  const c0 = { x: base.circle.cx, y: base.circle.cy };
  const W = mask.width;
  const H = mask.height;
  const exits = firstExits(p.outside, W, H, c0, nRays, w);
  const pts: PointPx[] = [];
  exits.forEach((t, i) => {
    if (t === null) return;
    const d = rayDirection((360 * i) / nRays);
    const q = { x: c0.x + t * d.x, y: c0.y + t * d.y };
    if (q.x > 1 && q.y > 1 && q.x < W - 2 && q.y < H - 2 && !inBoxes(frame.workMarks, q.x, q.y, 2)) pts.push(q);
  });
  const modelEllipse = robustEllipse(pts, Math.max(1.5, 0.15 * w));
  const choice = chooseOutline(p, modelEllipse, edges, centre0, nRays);
  const ring = choice.ring;
  const ellipse = ring ? fitEllipseToPoints(ring) : modelEllipse;
  const circle = ring ? fitCircle(ring) : ellipse ? fitCircle(ellipseOutline(ellipse, 360)) : null;
  if (!ellipse || !circle) throw new FractozoneError('NO_SPECIMEN', 'the outline the model finds is too short to fit an ellipse');
  const guide = ring ?? ellipseOutline(ellipse, nRays);
  // cut by the frame where the outline taken reaches it (the surface mask may reach it through a
  // holder or a flank the outline leaves out)
  const cut = guide.filter((q) => q.x <= 0 || q.y <= 0 || q.x >= W - 1 || q.y >= H - 1).length / guide.length;
  const specimen: Specimen = { ...base, circle, ellipse, touchesFrame: cut > 0, frameContactFraction: cut };
  const centerWork = { x: circle.cx, y: circle.cy };
  const outerWork = (ring ? outlineRadii(ring, centerWork, nRays) : crossings(p.outside, W, H, centerWork, guide, nRays, 0.5 * w, true)).map((r, i) => {
    const d = rayDirection((360 * i) / nRays);
    return r !== null && inFrame(centerWork, d, r, W, H) ? r : null;
  });
  const warnings: Warning[] = [];
  if (specimen.touchesFrame) {
    warnings.push(warn('SPECIMEN_CUT_BY_FRAME', `the specimen is cut by the image frame (${(specimen.frameContactFraction * 100).toFixed(0)} % of its outline): rays that reach the frame are not measured`));
  }
  const radiusPx = frame.lengthToFull(circle.radiusPx);
  const location: SpecimenLocation = {
    specimen,
    centerWork,
    center: frame.toFull(centerWork),
    outer: outerEdgeOnImage(frame, polygonOfRadii(outerWork, centerWork, nRays), centerWork, nRays),
    radiusPx,
    radiusUm: radiusPx * scale.umPerPx,
    warnings,
  };
  return { location, outerWork, choice };
}

/**
 * The outer edge on the full-resolution intensity (segment/outerEdge.ts: midpoint crossing of the
 * lightly smoothed intensity nearest the guide), twice: the second pass starts from the first one's
 * edge after a 5-ray running median, so a guide a few px off (the classifier's edge shifts with the
 * light on a flank) still ends on the step of the notch root.
 */
function outerEdgeOnImage(frame: WorkingFrame, guideWork: PointPx[], centerWork: PointPx, nRays: number): PointPx[] {
  const c = frame.toFull(centerWork);
  let guide = guideWork.map((q) => frame.toFull(q));
  for (let pass = 0; pass < 2; pass++) {
    const r = refineOuterEdge(frame.full, guide, c, { nRays });
    if (pass === 1) return r.polygon;
    guide = polygonOfRadii(circularMedian(r.radiiPx, 5), c, nRays);
  }
  return guide;
}

function inFrame(c: PointPx, d: PointPx, r: number, W: number, H: number): boolean {
  const x = c.x + r * d.x;
  const y = c.y + r * d.y;
  return x >= 0 && y >= 0 && x <= W - 1 && y <= H - 1;
}

/**
 * Runs the model branch (see the module comment).
 * @throws FractozoneError NO_SPECIMEN when the model finds no fracture surface
 */
export function segmentWithModel(input: ModelSegmentInput): ModelSegmentation {
  const { frame, scale, loaded } = input;
  const nRays = Math.max(input.nRays, 360);
  const umPerWorkPx = scale.umPerPx * frame.lengthScale;
  const ws = loaded.model.windowsUm;
  const w = windowPxAt(ws[Math.floor(ws.length / 2)], umPerWorkPx, frame.work.width, frame.work.height);
  const cues = outlineCues(frame);
  const centre0 = cues.centre;
  const p = predictProbabilities(frame.work, umPerWorkPx, loaded, centre0);
  const { location, outerWork, choice } = locate(frame, scale, p, w, centre0, nRays, cues.edges);
  const centre = location.centerWork;
  const q = coreShare(p);
  const rimCore = classifyRimCore(location.specimen, [createRaster(p.width, p.height, q)], { windowPx: w, featureScale: 1, center: centre, transforms: ['identity'] });
  const classification: Classification = { rimCore, warnings: [...rimCore.warnings] };
  const surfaceP = new Float32Array(p.outside.length);
  for (let i = 0; i < surfaceP.length; i++) surfaceP[i] = 1 - p.outside[i];
  const edgeConf = sideConfidence(surfaceP, p.outside, p.width, p.height, centre, outerWork, () => w / 2, () => w / 2) ?? 0;
  const warnings: Warning[] = [];
  if (!rimCore.detected || !rimCore.boundary) {
    const boundary: RimBoundary = { source: 'auto', polygon: null, detected: false, reason: rimCore.reason ?? 'no smooth rim band was found', separability: rimCore.separability };
    return { location, classification, boundary, probabilities: p, windowPxWork: w, windowUm: ws[Math.floor(ws.length / 2)], confidence: { boundary: null, outerEdge: edgeConf }, warnings };
  }
  const outerPoly = polygonOfRadii(outerWork, centre, nRays);
  // the model places the step (the matched step of q nearest the classified core outline), the
  // image refines it (the texture step of refineBoundary within a window of it); see the module comment
  // — each ray's own step (poolWindows 0): the guide is already the model's step, median-filtered over
  // 5 rays, and pooling the neighbours' profiles around it only added the pooled level's rimward pull
  // (series, images 1–5, measured 2026-12-03: SEM +1.24 / +0.46 / +0.28 / −0.91 / +3.16 % pooled,
  // +1.04 / +0.73 / +1.26 / −0.95 / +2.35 % not; tint-blue and both flank series closer too; the
  // independent noisier scan sem_noise +2.85 → +3.18 %: pooling helps under heavy noise)
  const guide = circularMedian(coreStep(q, p.width, p.height, centre, rimCore.boundary, outerWork, nRays, w, 1.5 * w), 5);
  const bRadii = refineBoundary(frame.work, outerPoly, polygonOfRadii(guide, centre, nRays), centre, { windowPx: w, nRays, searchWindows: 1, poolWindows: 0 }).radiiPx;
  // a boundary crossing beyond the outer edge is no boundary there
  const b = bRadii.map((r, i) => (r !== null && outerWork[i] !== null && r >= (outerWork[i] as number) ? null : r));
  const halfBand = (i: number): number => Math.max(0.5, Math.min(w / 2, ((outerWork[i] ?? 0) - (b[i] ?? 0)) / 2));
  const boundaryConf = sideConfidence(p.core, p.rim, p.width, p.height, centre, b, () => w / 2, halfBand);
  if (boundaryConf !== null && boundaryConf < MIN_MODEL_CONFIDENCE) {
    warnings.push(warn('LOW_MODEL_CONFIDENCE', `the model is unsure along the boundary it gives: mean class probability ${boundaryConf.toFixed(2)} < ${MIN_MODEL_CONFIDENCE}`));
  } else if (edgeConf < MIN_MODEL_CONFIDENCE) {
    warnings.push(warn('LOW_MODEL_CONFIDENCE', `the model is unsure along the outer edge it gives: mean class probability ${edgeConf.toFixed(2)} < ${MIN_MODEL_CONFIDENCE}`));
  }
  const boundary: RimBoundary = { source: 'auto', polygon: polygonOfRadii(b, centre, nRays).map((pt) => frame.toFull(pt)), detected: true, separability: rimCore.separability };
  return { location, classification, boundary, probabilities: p, windowPxWork: w, windowUm: ws[Math.floor(ws.length / 2)], confidence: { boundary: boundaryConf, outerEdge: edgeConf }, warnings };
}

/** The result's record of the model and its confidence. */
export function modelResult(loaded: LoadedModel, seg: ModelSegmentation): ResultModel {
  const r4 = (v: number): number => Math.round(v * 1e4) / 1e4;
  return {
    sha256: loaded.sha256,
    schema: loaded.model.schema,
    featureSet: loaded.model.featureSet,
    windowsUm: [...loaded.model.windowsUm],
    oobAccuracy: loaded.model.training.oobAccuracy,
    trainingImages: loaded.model.training.images.map((i) => i.sha256),
    confidence: { boundary: seg.confidence.boundary === null ? null : r4(seg.confidence.boundary), outerEdge: r4(seg.confidence.outerEdge) },
  };
}
