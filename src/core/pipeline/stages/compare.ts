/**
 * Stage 7, compare: the critical distance L = (1/π)(K_c/σ_0)² from the material and/or typed
 * values (tcd/resolve.ts), and the measured mean width held against L, L/2 or 2L with the verdict
 * and the toughness the width implies (tcd/compare.ts). Runs only when a material or typed values
 * are given; the comparison only when a band width was measured.
 */
import { Z975 } from '../../measure/tdist.js';
import type { Warning } from '../../warnings.js';
import { compareWidthWithL, impliedToughness, resolveCriticalDistance, type ImpliedToughness, type ResolvedDistance } from '../../tcd/index.js';
import type { BandUncertainty, Comparison, ComparisonBasis, WidthSummary } from '../result.js';
import type { MeasureParams, VerdictBasis } from '../types.js';


/** Input of {@link compareWithCriticalDistance}. */
export interface CompareStageInput {
  params: Pick<MeasureParams, 'material' | 'strainRatePerS' | 'seed' | 'reference' | 'tolerancePct' | 'verdictBasis'>;
  /** The band width as reported, or null when no band was measured. */
  width: WidthSummary | null;
  /** The band's uncertainty block (absent in results written before it). */
  uncertainty?: BandUncertainty | null;
}

const BASIS_TEXT: Record<VerdictBasis, string> = {
  measurement: 'the measurement interval of this specimen (boundary and outer-edge placement, scale)',
  circumferential: 'the circumferential interval (the mean of w(θ) as a random process)',
  'measurement+method': 'the measurement interval widened by the parameter range (half-range as a uniform bound)',
};

/**
 * The width interval the verdict uses: the chosen basis (default 'measurement'), or the
 * circumferential interval when the result has no uncertainty block (said so in the note).
 */
export function widthIntervalFor(w: WidthSummary, u: BandUncertainty | null | undefined, basis: VerdictBasis = 'measurement'): { ci95Um: [number, number]; basis: VerdictBasis; text: string } {
  if (basis === 'circumferential' || !u) {
    const text = basis === 'circumferential' ? BASIS_TEXT.circumferential : `${BASIS_TEXT.circumferential}; this result has no measurement interval`;
    return { ci95Um: [w.ci95[0], w.ci95[1]], basis: 'circumferential', text };
  }
  const [lo, hi] = u.measurementCi95Um;
  if (basis === 'measurement+method' && u.parameterRangeUm) {
    const um = (hi - lo) / (2 * Z975);
    const ur = (u.parameterRangeUm[1] - u.parameterRangeUm[0]) / 2 / Math.sqrt(3);
    const h = Z975 * Math.hypot(um, ur);
    return { ci95Um: [w.mean - h, w.mean + h], basis, text: BASIS_TEXT[basis] };
  }
  const b: VerdictBasis = basis === 'measurement+method' ? 'measurement' : basis;
  const text = basis === 'measurement+method' ? `${BASIS_TEXT.measurement}; no parameter range to widen it with` : BASIS_TEXT.measurement;
  return { ci95Um: [lo, hi], basis: b, text };
}

/** The sentence that says which intervals the comparison used. */
function basisOf(width: ReturnType<typeof widthIntervalFor>, cd: ResolvedDistance, reference: string): ComparisonBasis {
  const lText = cd.interval95_um ? `combined with the 95 % interval of L` : `${cd.intervalNote ?? 'L has no interval'}; L taken as exact`;
  return {
    width: width.basis,
    widthCi95Um: width.ci95Um,
    L: cd.interval95_um ? 'interval' : 'none',
    note: `Width/${reference} interval from ${width.text}, ${lText}.`,
  };
}

/** Output of {@link compareWithCriticalDistance}: absent blocks when there is nothing to compare. */
export interface CriticalDistanceBlocks {
  criticalDistance?: ResolvedDistance;
  comparison?: Comparison;
  warnings: Warning[];
}

/** Critical distance and comparison (see the module comment). */
export function compareWithCriticalDistance(input: CompareStageInput): CriticalDistanceBlocks {
  const p = input.params;
  const m = p.material;
  if (!m || (!m.material && !m.toughness && !m.strength)) return { warnings: [] };
  const cd = resolveCriticalDistance({
    material: m.material,
    toughness: m.toughness,
    strength: m.strength,
    strainRate: p.strainRatePerS ?? undefined,
    seed: p.seed,
  });
  const w = input.width;
  if (!w) return { criticalDistance: cd, warnings: [...cd.warnings] };
  const wi = widthIntervalFor(w, input.uncertainty, p.verdictBasis);
  const cmp = compareWidthWithL({
    widthUm: { mean: w.mean, ci95: wi.ci95Um },
    L_um: cd.L_um,
    L_interval95_um: cd.interval95_um,
    reference: p.reference,
    tolerancePct: p.tolerancePct,
  });
  let implied: ImpliedToughness | null = null;
  try {
    const s = cd.inputs.strength;
    implied = impliedToughness({ mean: w.mean, ci95: wi.ci95Um }, s.value, { sigma0Sd_MPa: s.sd ?? undefined, reference: p.reference });
  } catch {
    implied = null;
  }
  return { criticalDistance: cd, comparison: { ...cmp, basis: basisOf(wi, cd, cmp.reference), impliedToughness_MPa_sqrtm: implied }, warnings: [...cd.warnings] };
}
