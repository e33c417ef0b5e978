/**
 * Several specimens in one frame — usually both mating halves of a broken bar side by side: one
 * record per specimen (its own outline, band, warnings and verdict), the comparison of the two
 * halves' mean widths, and the result-level warnings that follow from them. Used by the full run
 * (analyse.ts) and by re-measuring a saved result (remeasure.ts), so both give the same blocks.
 *
 * Conventions (README "Both halves"): specimens are named A, B, … in reading order; the top-level
 * `specimen` and `band` of the result are A's, so every reader of a single-specimen result reads
 * A; `specimens[0]` repeats them. A result with one specimen has neither `specimens` nor `halves`.
 */
import { mergeWarnings, warn, type Warning, type WarningCode } from '../warnings.js';
import { round } from './precision.js';
import type { MeasureResult, ResultBand, ResultHalves, ResultScale, ResultSpecimen, ResultSpecimenRecord } from './result.js';
import { assessQuality, judgeQuality } from './stages/quality.js';

/** Relative difference of the halves' mean widths above which HALVES_DISAGREE is given, %. */
export const HALVES_TOLERANCE_PCT = 10;

/** Warnings that follow from the comparison of the specimens (re-made whenever a band changes). */
export const COMPARISON_CODES: ReadonlySet<WarningCode> = new Set<WarningCode>(['HALVES_DISAGREE', 'OTHER_SPECIMEN_UNSURE']);

/** Id of the i-th specimen in reading order: A, B, …, Z, then S27, S28, …. */
export function specimenId(i: number): string {
  return i < 26 ? String.fromCharCode(65 + i) : `S${i + 1}`;
}

/**
 * The record of one specimen: its warnings (outline, classification, measurement) with the
 * result-level rules applied to its own band, and the verdict from them.
 */
export function specimenRecord(id: string, specimen: ResultSpecimen, band: ResultBand, own: readonly Warning[], scale: ResultScale): ResultSpecimenRecord {
  const judged = judgeQuality({ warnings: own, band, scale });
  return { id, specimen, band, warnings: judged.warnings, quality: judged.quality };
}

/** The halves block of the first two records (only meaningful when there are exactly two). */
export function compareHalves(a: ResultSpecimenRecord, b: ResultSpecimenRecord): ResultHalves {
  const mean = (r: ResultSpecimenRecord): number | null => (r.band.detected && r.band.widthUm && Number.isFinite(r.band.widthUm.mean) ? r.band.widthUm.mean : null);
  const ma = mean(a);
  const mb = mean(b);
  const both = ma !== null && mb !== null;
  const avg = both ? (ma + mb) / 2 : 0;
  return {
    ids: [a.id, b.id],
    meanWidthsUm: [ma, mb],
    differenceUm: both ? round(ma - mb, 3) : null,
    relativeDifferencePct: both && avg > 0 ? round((100 * (ma - mb)) / avg, 2) : null,
  };
}

/** The warnings of the comparison: the halves disagree; another specimen is not `ok`. */
export function comparisonWarnings(records: readonly ResultSpecimenRecord[], halves: ResultHalves | null): Warning[] {
  const out: Warning[] = [];
  const d = halves?.relativeDifferencePct;
  if (halves && d !== null && d !== undefined && Math.abs(d) > HALVES_TOLERANCE_PCT) {
    const [ma, mb] = halves.meanWidthsUm;
    out.push(
      warn(
        'HALVES_DISAGREE',
        `the mean band widths of the two halves differ by ${Math.abs(d).toFixed(1)} % (${halves.ids[0]} ${ma?.toFixed(1)} µm, ${halves.ids[1]} ${mb?.toFixed(1)} µm; more than ${HALVES_TOLERANCE_PCT} %): check both outlines and boundaries on the overlay`,
      ),
    );
  }
  const unsure = records.slice(1).filter((r) => r.quality.verdict !== 'ok');
  if (unsure.length) {
    out.push(
      warn(
        'OTHER_SPECIMEN_UNSURE',
        `${unsure.map((r) => `specimen ${r.id} is '${r.quality.verdict}' (${r.quality.reasons.map((w) => w.code).join(', ')})`).join('; ')}: its width${halves ? ' and the difference of the halves' : ''} may be wrong`,
      ),
    );
  }
  return out;
}

/**
 * The result with its specimen records: `specimens`, `halves` (exactly two records) and the
 * comparison warnings merged into the top-level warnings, the verdict judged again. The caller
 * keeps `records[0]` equal to the top-level specimen and band.
 *
 * @param r - a result whose top-level blocks are specimen A's (warnings and quality of A and the scale)
 * @param records - the measured specimens, A first (two or more, or one when the others were skipped)
 * @param segmentation - warnings of finding the specimens (several found, one skipped), kept as they are
 */
export function withSpecimens(r: MeasureResult, records: ResultSpecimenRecord[], segmentation: readonly Warning[] = []): MeasureResult {
  const halves = records.length === 2 ? compareHalves(records[0], records[1]) : null;
  const base = r.warnings.filter((w) => !COMPARISON_CODES.has(w.code));
  const warnings = mergeWarnings(mergeWarnings(base, segmentation), comparisonWarnings(records, halves));
  const out: MeasureResult = { ...r, specimens: records, warnings, quality: assessQuality(warnings) };
  if (halves) out.halves = halves;
  else delete out.halves;
  return out;
}
