/**
 * Stage 7, compare: the critical distance L = (1/π)(K_c/σ_0)² from the material and/or typed
 * values (tcd/resolve.ts), and the measured mean width held against L, L/2 or 2L with the verdict
 * and the toughness the width implies (tcd/compare.ts). Runs only when a material or typed values
 * are given; the comparison only when a band width was measured.
 */
import type { Warning } from '../../warnings.js';
import { compareWidthWithL, impliedToughness, resolveCriticalDistance, type ImpliedToughness, type ResolvedDistance } from '../../tcd/index.js';
import type { Comparison, WidthSummary } from '../result.js';
import type { MeasureParams } from '../types.js';

/** Input of {@link compareWithCriticalDistance}. */
export interface CompareStageInput {
  params: Pick<MeasureParams, 'material' | 'strainRatePerS' | 'seed' | 'reference' | 'tolerancePct'>;
  /** The band width as reported, or null when no band was measured. */
  width: WidthSummary | null;
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
  const cmp = compareWidthWithL({
    widthUm: { mean: w.mean, ci95: w.ci95 },
    L_um: cd.L_um,
    L_interval95_um: cd.interval95_um,
    reference: p.reference,
    tolerancePct: p.tolerancePct,
  });
  let implied: ImpliedToughness | null = null;
  try {
    const s = cd.inputs.strength;
    implied = impliedToughness({ mean: w.mean, ci95: w.ci95 }, s.value, { sigma0Sd_MPa: s.sd ?? undefined, reference: p.reference });
  } catch {
    implied = null;
  }
  return { criticalDistance: cd, comparison: { ...cmp, impliedToughness_MPa_sqrtm: implied }, warnings: [...cd.warnings] };
}
