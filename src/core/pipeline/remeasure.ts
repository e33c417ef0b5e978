/**
 * Re-measuring a saved result: the measure, compare and quality stages on the stored outline and
 * an edited boundary, without the image. What the web app runs on every edit (~25 ms for 360 rays).
 */
import { mergeWarnings, type Warning, type WarningCode } from '../warnings.js';
import { validateParams } from './params.js';
import { storedPolygon } from './precision.js';
import { inResultOrder, type MeasureResult, type ParameterVariation } from './result.js';
import { reportWidths, withMeasurement } from './stages/assemble.js';
import { compareWithCriticalDistance } from './stages/compare.js';
import { measureWidths, minWidthPxFor } from './stages/measure.js';
import { judgeQuality, RULE_CODES } from './stages/quality.js';
import { bandUncertainty, MANUAL_RANGE_NOTE } from './stages/uncertainty.js';
import type { MeasureParams } from './types.js';

/**
 * The method variations of the first measurement, scaled by the ratio of the new mean width to
 * the old one (the same boundary at a new scale gives exactly that ratio; other sectors or rays
 * shift the variations with the mean, an approximation until the image is measured again).
 */
function keptVariations(prev: MeasureResult, newMean: number | null): ParameterVariation[] {
  const old = prev.band.widthUm?.mean;
  const k = newMean !== null && old ? newMean / old : 1;
  return (prev.band.uncertainty?.variations ?? []).map((v) => ({ name: v.name, meanUm: v.meanUm === null ? null : v.meanUm * k }));
}

/** Warnings of the stages that re-measuring runs again (the new run gives them again, or not). */
const REMADE: ReadonlySet<WarningCode> = new Set<WarningCode>([
  'SCALE_MARK_ON_OUTLINE',
  'INVENTED_MATERIAL',
  'L_FROM_RATE_LAW',
  'SIGMA0_FROM_RATE_LAW',
  'RATE_EXTRAPOLATED',
  ...RULE_CODES,
]);

/**
 * Re-measure a previous result with an edited boundary polygon and/or changed measurement
 * parameters (rays, exclusion sectors, outliers, bootstrap, material): pure geometry on the
 * stored outline, no image access. Gives the same numbers as a full run with the same boundary.
 *
 * @param prev - a previous result (from analyseImage or a result JSON of this schema)
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
  let warnings: Warning[] = prev.warnings.filter((w) => !REMADE.has(w.code));
  if (polygon && result.band.boundary) {
    const measured = measureWidths({
      geometry: { outline: result.specimen.outline, boundary: result.band.boundary.polygon, center: result.specimen.center, marks: result.specimen.scaleMarksPx ?? [] },
      umPerPx: { x: result.scale.umPerPxX, y: result.scale.umPerPxY },
      imageSize: { width: result.input.widthPx, height: result.input.heightPx },
      minWidthPx: minWidthPxFor(result.resolved.boundarySource, result.resolved.windowPx),
      params: p,
    });
    warnings = mergeWarnings(warnings, measured.warnings);
    if (measured.profile) result.band = withMeasurement(result.band, reportWidths(measured.profile, { x: result.scale.umPerPxX, y: result.scale.umPerPxY }));
    const src = result.resolved.boundarySource;
    const u = bandUncertainty({
      band: result.band,
      scale: result.scale,
      params: p,
      origin: src === 'manual' ? { kind: 'manual' } : { kind: 'auto', workPxUm: result.scale.umPerPx * result.resolved.workingScaleFactor },
      // the method variations need the image: kept from the first measurement while its boundary stands
      variations:
        !changes.boundaryPolygon && prev.band.uncertainty?.parameterRangeUm
          ? keptVariations(prev, result.band.widthUm?.mean ?? null)
          : { none: changes.boundaryPolygon ? MANUAL_RANGE_NOTE : (prev.band.uncertainty?.parameterRangeNote ?? 're-measured without the image: measure the image again for the parameter range') },
    });
    if (u) result.band.uncertainty = u;
    else delete result.band.uncertainty;
  }
  const tcd = compareWithCriticalDistance({ params: p, width: result.band.detected ? result.band.widthUm : null, uncertainty: result.band.uncertainty ?? null });
  const judged = judgeQuality({ warnings: mergeWarnings(warnings, tcd.warnings), band: result.band, scale: result.scale });
  return inResultOrder({
    ...result,
    criticalDistance: tcd.criticalDistance,
    comparison: tcd.comparison,
    warnings: judged.warnings,
    quality: judged.quality,
    diagnostics: { timingsMs: {} },
  });
}
