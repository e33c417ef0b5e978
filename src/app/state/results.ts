/**
 * Results follow inputs: a document's inputs → the one parameter object the engine (and the
 * command line) understands, the key that names those inputs, and whether the result shown is
 * current, out of date (and why), or missing. A result is current only when it was computed for
 * exactly the inputs on screen; anything else is shown as stale, with exports disabled.
 */
import { canonicalJson, defaultParams, fullRunReason, isFractozoneError, type MeasureParams, type PointPx } from '../../core/index.js';
import { materialOf, settingsOf, type Doc, type Series } from './document.js';
import { materialParamsOf } from './material.js';
import { scaleOf, scaleParamsOf } from './scale.js';

/**
 * The full parameter object of a document. For a full run ("Find boundary") the boundary drawn
 * by hand is not sent: the run finds its own.
 */
export function paramsOf(doc: Doc, series: Series, opts: { fullRun?: boolean } = {}): MeasureParams {
  const p = defaultParams();
  const s = settingsOf(doc, series);
  const m = materialOf(doc, series);
  const tol = p.scale.pixelSizeTolerancePct;
  p.scale = { ...scaleParamsOf(doc.scale), ...(tol === undefined ? {} : { pixelSizeTolerancePct: tol }) };
  p.windowUm = s.windowUm;
  p.features = [...s.features];
  p.nRays = s.nRays;
  p.dropOutliers = s.dropOutliers;
  p.outlierK = s.outlierK;
  p.bootstrap = s.bootstrap;
  p.seed = s.seed;
  p.exclude = doc.exclude.map(([a, b]): [number, number] => [a, b]);
  p.material = materialParamsOf(m, doc.strainRatePerS);
  p.strainRatePerS = doc.strainRatePerS;
  p.reference = m.reference;
  p.tolerancePct = m.tolerancePct;
  p.boundaryPolygon = !opts.fullRun && doc.boundary ? doc.boundary.map((q) => ({ x: q.x, y: q.y })) : null;
  if (series.model) p.modelSha256 = series.model.sha256;
  if (doc.sectionDiameterUm !== null) p.sectionDiameterUm = doc.sectionDiameterUm;
  return p;
}

/** What the engine is asked to recompute for a document, named by its key. */
export interface RecomputeRequest {
  key: string;
  params: MeasureParams;
  outline: PointPx[] | null;
}

/** The request for the document's current inputs (null before the first full run). */
export function requestOf(doc: Doc, series: Series): RecomputeRequest | null {
  if (!doc.base) return null;
  const params = paramsOf(doc, series);
  const outline = doc.outline;
  return { key: canonicalJson({ base: doc.base.id, params, outline }), params, outline };
}

export type ResultState = { state: 'none' | 'current' | 'stale'; reason: string | null };

/** Why the inputs need a full run ("Find boundary") before numbers can be shown, or null. */
export function needsFullRun(doc: Doc, series: Series): string | null {
  if (!doc.base) return null;
  const params = paramsOf(doc, series);
  if ((doc.base.result.params.modelSha256 ?? null) !== (params.modelSha256 ?? null)) {
    return `Out of date: ${params.modelSha256 ? 'the images are now measured with a taught model' : 'the images are now measured without a model'}. Press “Find boundary” to measure again.`;
  }
  try {
    const r = fullRunReason(doc.base.result, params);
    return r ? `Out of date: ${r}. Press “Find boundary” to measure again.` : null;
  } catch (e) {
    if (isFractozoneError(e)) return `Out of date: ${e.message}.`;
    throw e;
  }
}

/** Whether the result shown belongs to the inputs on screen, and if not, why. */
export function resultStateOf(doc: Doc, series: Series): ResultState {
  if (!doc.base) {
    if (doc.busy === 'analysing') return { state: 'none', reason: 'Measuring…' };
    // a scale already known (typed, metadata, a bar with its length) needs no setting first
    return { state: 'none', reason: scaleOf(doc).ok ? 'Not measured yet: press “Find boundary”.' : null };
  }
  const scale = scaleOf(doc);
  if (!scale.ok) return { state: 'stale', reason: `Out of date: ${scale.problem}` };
  const full = needsFullRun(doc, series);
  if (full) return { state: 'stale', reason: full };
  const req = requestOf(doc, series);
  if (req && doc.refused?.key === req.key) return { state: 'stale', reason: `Out of date: ${doc.refused.message}` };
  if (req && doc.result && doc.resultKey === req.key) return { state: 'current', reason: null };
  return { state: 'stale', reason: 'Updating…' };
}

/** True when the document's inputs changed since its result was computed and the engine should recompute. */
export function wantsRecompute(doc: Doc, series: Series): RecomputeRequest | null {
  const req = requestOf(doc, series);
  if (!req || doc.resultKey === req.key || doc.refused?.key === req.key) return null;
  if (!scaleOf(doc).ok || needsFullRun(doc, series)) return null;
  return req;
}
