/**
 * The summary figures of one result, picked, labelled and given their units in one place, for
 * every view that shows them: the command-line summary, the overlay label, the HTML reports and
 * the app's results table. Views only lay the figures out and format the numbers (`formatFigure`
 * or their own precision); which figures exist, what they are called and in which unit they are
 * is decided here.
 */
import type { ScaleSource } from '../calibrate/scale.js';
import type { PointPx } from '../image/geometry.js';
import type { MeasureResult, QualityVerdict } from '../pipeline/result.js';
import { severityOf, type Warning } from '../warnings.js';
import type { Verdict, WidthReference } from '../tcd/compare.js';

/** Units of the summary figures. */
export type SummaryUnit = 'µm' | 'µm/px' | 'MPa·√m' | '';

/** One number with its label and unit; `value` is null when it is not available (printed "—"). */
export interface Figure {
  label: string;
  value: number | null;
  unit: SummaryUnit;
}

/** A 95 % interval with its label and unit. */
export interface IntervalFigure {
  label: string;
  lo: number | null;
  hi: number | null;
  unit: SummaryUnit;
}

/** The band figures when a band was measured. */
export interface MeasuredBandSummary {
  detected: true;
  mean: Figure;
  ci95: IntervalFigure;
  /** Valid rays and the effective sample size of the correlated profile. */
  n: number;
  nEff: number;
  median: Figure;
  medianCi95: IntervalFigure;
  sd: Figure;
  min: Figure;
  p05: Figure;
  p95: Figure;
  max: Figure;
  /** Mean width along the inward normal of the outer edge, when available. */
  normalMean: Figure | null;
  /** Area-equivalent width, when the whole section was measured. */
  areaEquivalent: Figure | null;
  /** Rays flagged as outliers, and whether they were left out of the statistics. */
  outliers: { count: number; dropped: boolean } | null;
  /** The three intervals of the mean (result `band.uncertainty`), or null in results written before them. */
  uncertainty: UncertaintySummary | null;
}

/** The uncertainty of the mean width as views show it. */
export interface UncertaintySummary {
  /** This specimen's mean: placement of boundary and outer edge, and scale. */
  measurement: IntervalFigure;
  /** The mean of w(θ) as a random process (= `ci95`). */
  circumferential: IntervalFigure;
  /** Min–max of the mean over the method variations, or null (`rangeNote` says why). */
  parameterRange: IntervalFigure | null;
  rangeNote: string;
  /** "boundary 5.2 µm (78 %), outer edge 2.6 µm (19 %), scale 1.0 µm (3 %)": standard uncertainties and shares. */
  budget: string;
}

/** No band: why. */
export interface MissingBandSummary {
  detected: false;
  reason: string;
}

/** The critical distance shown. */
export interface CriticalDistanceSummary {
  L: Figure;
  interval95: IntervalFigure | null;
  /** How L was obtained ("static", "strain-rate law for L", …). */
  basis: string;
  /** Why L has no interval, in words ("L has no interval: the law gives none"), or null. */
  intervalNote: string | null;
}

/** The width against the reference. */
export interface ComparisonSummary {
  reference: WidthReference;
  ratio: Figure;
  ratioInterval95: IntervalFigure;
  verdict: Verdict;
  tolerancePct: number;
  impliedToughness: Figure | null;
  /** Its 95 % interval (from the width's interval used for the verdict and the sd of σ_0), or null when neither has a spread. */
  impliedToughnessInterval95: IntervalFigure | null;
  /** Which intervals the ratio interval and the verdict used (one sentence). */
  basisNote: string;
}

/** The quality verdict as views show it. */
export interface QualitySummary {
  verdict: QualityVerdict;
  /** One line for people: "ok", "check: look at …", "unreliable: …". */
  headline: string;
  /** The warnings that set the verdict. */
  reasons: Warning[];
}

/** What each verdict tells the reader (the same words in every view). */
export const VERDICT_HEADLINES: Record<QualityVerdict, string> = {
  ok: 'ok: no warning that affects the numbers',
  check: 'check: look at the image and the overlay before using the numbers',
  unreliable: 'unreliable: the numbers are likely wrong as they stand',
};

/** Every figure a view of one result shows. */
export interface ResultSummary {
  file: string;
  /** Read first: whether the numbers can be used as they stand. */
  quality: QualitySummary;
  /** "jpeg, 1600×1200 px, 8-bit". */
  image: string;
  scale: { umPerPx: Figure; source: ScaleSource; detail: string };
  specimen: { centerPx: PointPx; radius: Figure; cutByFrame: boolean };
  band: MeasuredBandSummary | MissingBandSummary;
  /** Separability of the rim and core textures (also when no band was found), or null (manual boundary). */
  separability: { fisher: Figure; overlap: Figure } | null;
  criticalDistance: CriticalDistanceSummary | null;
  comparison: ComparisonSummary | null;
  /** All warnings with their codes; `notes` are those of severity info (not among the reasons). */
  warnings: Warning[];
  notes: Warning[];
  caution: string;
}

const fig = (label: string, value: number | null | undefined, unit: SummaryUnit): Figure => ({
  label,
  value: typeof value === 'number' && Number.isFinite(value) ? value : null,
  unit,
});

const interval = (label: string, v: readonly [number, number] | null | undefined, unit: SummaryUnit): IntervalFigure => ({
  label,
  lo: v && Number.isFinite(v[0]) ? v[0] : null,
  hi: v && Number.isFinite(v[1]) ? v[1] : null,
  unit,
});

function bandSummary(r: MeasureResult): MeasuredBandSummary | MissingBandSummary {
  const b = r.band;
  const w = b.widthUm;
  if (!b.detected || !w) return { detected: false, reason: b.reason ?? 'no smooth rim' };
  return {
    detected: true,
    mean: fig('mean width', w.mean, 'µm'),
    ci95: interval('95 % circumferential interval', w.ci95, 'µm'),
    n: w.n,
    nEff: w.nEff,
    median: fig('median width', w.median, 'µm'),
    medianCi95: interval('95 % circumferential interval of the median', w.medianCi95, 'µm'),
    sd: fig('SD of width', w.sd, 'µm'),
    min: fig('min', w.min, 'µm'),
    p05: fig('p05', w.p05, 'µm'),
    p95: fig('p95', w.p95, 'µm'),
    max: fig('max', w.max, 'µm'),
    normalMean: b.normalWidthUm ? fig('normal width', b.normalWidthUm.mean, 'µm') : null,
    areaEquivalent: b.areaEquivalentWidthUm !== null ? fig('area-equivalent width', b.areaEquivalentWidthUm, 'µm') : null,
    outliers: b.nOutliers ? { count: b.nOutliers, dropped: r.params.dropOutliers } : null,
    uncertainty: uncertaintySummary(r),
  };
}

function uncertaintySummary(r: MeasureResult): UncertaintySummary | null {
  const u = r.band.uncertainty;
  if (!u) return null;
  const t = (name: string, x: { sdUm: number; sharePct: number }): string => `${name} ${x.sdUm.toFixed(1)} µm (${x.sharePct.toFixed(0)} %)`;
  const g = u.budget;
  return {
    measurement: interval('95 % measurement interval', u.measurementCi95Um, 'µm'),
    circumferential: interval('95 % circumferential interval', u.circumferentialCi95Um, 'µm'),
    parameterRange: u.parameterRangeUm ? interval('parameter range', u.parameterRangeUm, 'µm') : null,
    rangeNote: u.parameterRangeNote,
    budget: `${t('boundary', g.boundary)}, ${t('outer edge', g.outerEdge)}, ${t('scale', g.scale)}`,
  };
}

/** The summary figures of a result (see the module comment). */
export function summarise(r: MeasureResult): ResultSummary {
  const cd = r.criticalDistance;
  const c = r.comparison;
  // a result read back from an older or partial file may lack the verdict: say so, never "ok"
  const q = r.quality ?? { verdict: 'check' as const, reasons: [] };
  return {
    file: r.input.file,
    quality: { verdict: q.verdict, headline: VERDICT_HEADLINES[q.verdict], reasons: q.reasons },
    image: `${r.input.format}, ${r.input.widthPx}×${r.input.heightPx} px, ${r.input.bitDepth}-bit`,
    scale: { umPerPx: fig('pixel size', r.scale.umPerPx, 'µm/px'), source: r.scale.source, detail: r.scale.detail },
    specimen: { centerPx: r.specimen.center, radius: fig('specimen radius', r.specimen.radiusUm, 'µm'), cutByFrame: r.specimen.touchesFrame },
    band: bandSummary(r),
    separability: r.band.separability ? { fisher: fig('Fisher ratio', r.band.separability.fisher, ''), overlap: fig('histogram overlap', r.band.separability.overlap, '') } : null,
    criticalDistance: cd ? { L: fig('L', cd.L_um, 'µm'), interval95: cd.interval95_um ? interval('95 % interval of L', cd.interval95_um, 'µm') : null, basis: cd.basis, intervalNote: cd.interval95_um ? null : (cd.intervalNote ?? 'L has no interval') } : null,
    comparison: c
      ? {
          reference: c.reference,
          ratio: fig(`width / ${c.reference}`, c.ratio, ''),
          ratioInterval95: interval('95 % interval of the ratio', c.ratioInterval95, ''),
          verdict: c.verdict,
          tolerancePct: c.tolerancePct,
          impliedToughness: c.impliedToughness_MPa_sqrtm ? fig('implied K', c.impliedToughness_MPa_sqrtm.K_MPa_sqrtm, 'MPa·√m') : null,
          impliedToughnessInterval95: c.impliedToughness_MPa_sqrtm?.interval95_MPa_sqrtm
            ? interval('95 % interval of the implied K', c.impliedToughness_MPa_sqrtm.interval95_MPa_sqrtm, 'MPa·√m')
            : null,
          basisNote: c.basis?.note ?? 'Width/L interval from the circumferential interval (a result written before the measurement interval).',
        }
      : null,
    warnings: [...r.warnings],
    notes: r.warnings.filter((w) => severityOf(w.code) === 'info'),
    caution: r.caution,
  };
}

/** One specimen of several in the frame (both halves): id, mean width, verdict. */
export interface SpecimenLine {
  id: string;
  centerPx: PointPx;
  mean: Figure;
  verdict: QualityVerdict;
}

/**
 * The lines a view shows when the image held several specimens (none for one): each specimen's
 * mean width and verdict, then the difference of the halves; the other figures of the view are
 * specimen A's.
 */
export function specimenLines(r: MeasureResult): string[] {
  if (!r.specimens || r.specimens.length < 2) return [];
  const list: SpecimenLine[] = r.specimens.map((x) => ({
    id: x.id,
    centerPx: x.specimen.center,
    mean: fig('mean width', x.band.detected ? x.band.widthUm?.mean : null, 'µm'),
    verdict: x.quality.verdict,
  }));
  const lines = [`${list.length} specimens (figures above: A): ${list.map((x) => `${x.id} ${x.mean.value === null ? 'no band' : `${x.mean.value.toFixed(1)} µm`} (${x.verdict})`).join(', ')}`];
  const h = r.halves;
  if (h) {
    const d = h.differenceUm;
    const pct = h.relativeDifferencePct;
    lines.push(`halves ${h.ids[0]} - ${h.ids[1]}: ${d === null ? 'not both measured' : `${d >= 0 ? '+' : ''}${d.toFixed(1)} µm (${pct === null ? '—' : `${pct >= 0 ? '+' : ''}${pct.toFixed(1)} %`})`}`);
  }
  return lines;
}

/**
 * A figure as text: the value with `decimals` decimals and its unit ("577.2 µm"), or "—".
 * @param f the figure
 * @param decimals digits after the decimal point
 */
export function formatFigure(f: Figure, decimals: number): string {
  if (f.value === null) return '—';
  return f.unit ? `${f.value.toFixed(decimals)} ${f.unit}` : f.value.toFixed(decimals);
}

/** A number with `decimals` decimals, or "—" when not available. */
export function formatValue(v: number | null, decimals: number): string {
  return v === null || !Number.isFinite(v) ? '—' : v.toFixed(decimals);
}
