/** Reopening a session: the image's inputs as the session file holds them. */
import { canonicalJson, isFeatureName, type Session } from '../../../core/index.js';
import type { Analysis, AnalysisSettings, Doc, Series } from '../document.js';
import { materialFormOf } from '../material.js';
import { scaleChoiceOf } from '../scale.js';
import { docEdit, type Change } from './types.js';

/**
 * The inputs of a session for this image, with the full run made for them when the session had
 * been measured — one history entry. Settings and material that equal the series' stay the
 * series'; others become the image's own.
 */
export function reopenSession(doc: Doc, series: Series, session: Session, sessionFile: string, run: Analysis | null): Change {
  const p = session.params;
  const settings: AnalysisSettings = { windowUm: p.windowUm, features: p.features.filter(isFeatureName), nRays: p.nRays, dropOutliers: p.dropOutliers, outlierK: p.outlierK, bootstrap: p.bootstrap, seed: p.seed };
  const material = materialFormOf(p, sessionFile);
  return docEdit('reopen session', {
    scale: scaleChoiceOf(p.scale),
    settings: canonicalJson(settings) === canonicalJson(series.settings) ? null : settings,
    material: canonicalJson(material) === canonicalJson(series.material) ? null : material,
    strainRatePerS: p.strainRatePerS,
    sectionDiameterUm: p.sectionDiameterUm ?? null,
    exclude: p.exclude.map(([a, b]): [number, number] => [a, b]),
    boundary: p.boundaryPolygon,
    outline: session.outline,
    ...(run ? { base: run } : {}),
  });
}
