/**
 * Re-measuring a saved result: the measure, compare and quality stages on the stored outline and
 * an edited boundary, without the image. What the web app runs on every edit (~25 ms for 360 rays).
 */
import { mergeWarnings, type Warning, type WarningCode } from '../warnings.js';
import { validateParams } from './params.js';
import { storedPolygon } from './precision.js';
import { inResultOrder, type BoundarySource, type MeasureResult, type ResultBand, type ResultSpecimen, type ResultSpecimenRecord, type ParameterVariation } from './result.js';
import { COMPARISON_CODES, specimenRecord, withSpecimens } from './specimens.js';
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
function keptVariations(prev: ResultBand, newMean: number | null): ParameterVariation[] {
  const old = prev.widthUm?.mean;
  const k = newMean !== null && old ? newMean / old : 1;
  return (prev.uncertainty?.variations ?? []).map((v) => ({ name: v.name, meanUm: v.meanUm === null ? null : v.meanUm * k }));
}

/**
 * The uncertainty block of a re-measured band (in place): the method variations need the image, so
 * they are kept from the first measurement while its boundary stands.
 */
function withUncertainty(r: MeasureResult, band: ResultBand, prev: ResultBand, src: BoundarySource, p: MeasureParams, boundaryEdited: boolean): void {
  const u = bandUncertainty({
    band,
    scale: r.scale,
    params: p,
    origin: src === 'manual' ? { kind: 'manual' } : { kind: 'auto', workPxUm: r.scale.umPerPx * r.resolved.workingScaleFactor },
    variations:
      !boundaryEdited && prev.uncertainty?.parameterRangeUm
        ? keptVariations(prev, band.widthUm?.mean ?? null)
        : { none: boundaryEdited ? MANUAL_RANGE_NOTE : (prev.uncertainty?.parameterRangeNote ?? 're-measured without the image: measure the image again for the parameter range') },
  });
  if (u) band.uncertainty = u;
  else delete band.uncertainty;
}

/** Warnings of the stages that re-measuring runs again (the new run gives them again, or not). */
const REMADE: ReadonlySet<WarningCode> = new Set<WarningCode>([
  'SCALE_MARK_ON_OUTLINE',
  'INVENTED_MATERIAL',
  'L_FROM_RATE_LAW',
  'SIGMA0_FROM_RATE_LAW',
  'RATE_EXTRAPOLATED',
  ...RULE_CODES,
  ...COMPARISON_CODES,
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
  let measuredA: Warning[] = [];
  if (polygon && result.band.boundary) {
    const again = measureAgain(result, result.specimen, result.band, result.resolved.boundarySource, p);
    measuredA = again.warnings;
    warnings = mergeWarnings(warnings, again.warnings);
    result.band = again.band;
    withUncertainty(result, result.band, prev.band, result.resolved.boundarySource, p, !!changes.boundaryPolygon);
  }
  const tcd = compareWithCriticalDistance({ params: p, width: result.band.detected ? result.band.widthUm : null, uncertainty: result.band.uncertainty ?? null });
  const judged = judgeQuality({ warnings: mergeWarnings(warnings, tcd.warnings), band: result.band, scale: result.scale });
  let out: MeasureResult = {
    ...result,
    criticalDistance: tcd.criticalDistance,
    comparison: tcd.comparison,
    warnings: judged.warnings,
    quality: judged.quality,
    diagnostics: { timingsMs: {} },
  };
  if (prev.specimens && prev.specimens.length) {
    // the edit (boundary, outline) is specimen A's, the top-level blocks; the parameters (rays,
    // sectors, outlier rule) apply to every specimen, as in a full run
    const records = prev.specimens.map((rec, i): ResultSpecimenRecord => {
      const own = rec.warnings.filter((w) => !REMADE.has(w.code));
      if (i === 0) return specimenRecord(rec.id, result.specimen, result.band, mergeWarnings(own, measuredA), result.scale);
      if (!rec.band.boundary) return specimenRecord(rec.id, rec.specimen, rec.band, own, result.scale);
      const again = measureAgain(result, rec.specimen, rec.band, rec.band.boundary.source, p);
      withUncertainty(result, again.band, rec.band, rec.band.boundary.source, p, false);
      return specimenRecord(rec.id, rec.specimen, again.band, mergeWarnings(own, again.warnings), result.scale);
    });
    out = withSpecimens(out, records);
  }
  return inResultOrder(out);
}

/** A band measured again on its stored outline and boundary with the parameters `p`. */
function measureAgain(r: MeasureResult, specimen: ResultSpecimen, band: ResultBand, source: BoundarySource, p: MeasureParams): { band: ResultBand; warnings: Warning[] } {
  if (!band.boundary) return { band, warnings: [] };
  const umPerPx = { x: r.scale.umPerPxX, y: r.scale.umPerPxY };
  const measured = measureWidths({
    geometry: { outline: specimen.outline, boundary: band.boundary.polygon, center: specimen.center, marks: specimen.scaleMarksPx ?? [] },
    umPerPx,
    imageSize: { width: r.input.widthPx, height: r.input.heightPx },
    minWidthPx: minWidthPxFor(source, r.resolved.windowPx),
    params: p,
  });
  return { band: measured.profile ? withMeasurement(band, reportWidths(measured.profile, umPerPx)) : band, warnings: measured.warnings };
}
