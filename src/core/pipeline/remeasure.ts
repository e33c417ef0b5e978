/**
 * Re-measuring a saved result: the measure and compare stages on the stored outline and an edited
 * boundary, without the image. What the web app runs on every edit (~25 ms for 360 rays).
 */
import { storedPolygon } from './precision.js';
import type { MeasureResult } from './result.js';
import { reportWidths, withMeasurement } from './stages/assemble.js';
import { compareWithCriticalDistance } from './stages/compare.js';
import { measureWidths, minWidthPxFor } from './stages/measure.js';
import { validateParams } from './params.js';
import type { MeasureParams } from './types.js';
import { mergeWarnings } from './warnings.js';

/** Warnings of the compare stage, given again (or not) by the new run. */
const TCD_WARNING = /strain-rate law|invented demo data|extrapolat/;

/**
 * Re-measure a previous result with an edited boundary polygon and/or changed measurement
 * parameters (rays, exclusion sectors, outliers, bootstrap, material): pure geometry on the
 * stored outline, no image access. Gives the same numbers as a full run with the same boundary.
 *
 * @param prev - a previous result (from analyseImage or a result JSON)
 * @param changes - parameters to change; `boundaryPolygon` is the edited boundary (px)
 */
export function remeasure(prev: MeasureResult, changes: Partial<MeasureParams>): MeasureResult {
  const p = validateParams({ ...structuredClone(prev.params), ...structuredClone(changes) });
  const result: MeasureResult = structuredClone(prev);
  result.params = p;
  const polygon = p.boundaryPolygon ?? prev.band.boundary?.polygon ?? null;
  if (changes.boundaryPolygon) {
    result.resolved.boundarySource = 'manual';
    result.band.boundary = { source: 'manual', polygon: storedPolygon(changes.boundaryPolygon) };
  }
  const warnings = prev.warnings.filter((w) => !TCD_WARNING.test(w));
  if (polygon && result.band.boundary) {
    const measured = measureWidths({
      geometry: { outline: result.specimen.outline, boundary: result.band.boundary.polygon, center: result.specimen.center, marks: result.specimen.scaleMarksPx ?? [] },
      umPerPx: { x: result.scale.umPerPxX, y: result.scale.umPerPxY },
      imageSize: { width: result.input.widthPx, height: result.input.heightPx },
      minWidthPx: minWidthPxFor(result.resolved.boundarySource, result.resolved.windowPx),
      params: p,
    });
    if (measured.profile) result.band = withMeasurement(result.band, reportWidths(measured.profile, { x: result.scale.umPerPxX, y: result.scale.umPerPxY }));
  }
  delete result.criticalDistance;
  delete result.comparison;
  const tcd = compareWithCriticalDistance({ params: p, width: result.band.detected ? result.band.widthUm : null });
  result.warnings = mergeWarnings(warnings, tcd.warnings);
  result.diagnostics = { timingsMs: {} };
  if (tcd.criticalDistance) result.criticalDistance = tcd.criticalDistance;
  if (tcd.comparison) result.comparison = tcd.comparison;
  return result;
}
