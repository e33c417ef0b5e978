/**
 * One call for the measurement pipeline and the shells: the critical distance for a material and/or
 * typed values, optionally at a strain rate, with its uncertainty and the method distances.
 */
import { FractozoneError } from '../errors.js';
import { warn, type Warning } from '../warnings.js';
import { criticalDistance, methodDistances, type MethodDistances } from './criticalDistance.js';
import { evaluateRateLaw } from './dynamic.js';
import type { Material, MaterialValue } from './materials.js';
import { criticalDistanceUncertainty, type Scatter } from './uncertainty.js';

/** A typed value in engine units (MPa·√m or MPa) with optional scatter. */
export interface QuantityInput {
  value: number;
  sd?: number;
  interval?: [number, number];
  /** Where the value comes from (default "command line"). */
  source?: string;
}

/** Input of {@link resolveCriticalDistance}. Typed values override the material's. */
export interface ResolveInput {
  material?: Material;
  /** K_c in MPa·√m. */
  toughness?: QuantityInput;
  /** σ_0 in MPa. */
  strength?: QuantityInput;
  /** Strain rate in 1/s; needs a strain-rate law in the material. */
  strainRate?: number;
  /** Accept strain rates outside a tabulated law (with a warning). */
  allowExtrapolation?: boolean;
  /** Monte Carlo seed (default 1) and number of draws (default 20 000). */
  seed?: number;
  draws?: number;
}

/** An input echoed with its unit and source. */
export interface EchoedValue {
  value: number;
  unit: string;
  sd: number | null;
  interval95: [number, number] | null;
  source: string;
}

/** Output of {@link resolveCriticalDistance}. */
export interface ResolvedDistance extends MethodDistances {
  L_um: number;
  /** Monte Carlo 95 % interval (static basis with scatter), null otherwise. */
  interval95_um: [number, number] | null;
  /** Why L has no interval (in words), or null when it has one. */
  intervalNote: string | null;
  median_um: number | null;
  /** First-order interval for comparison, null without scatter. */
  deltaInterval95_um: [number, number] | null;
  basis: 'static' | 'strain-rate law for L' | 'strain-rate law for σ_0';
  inputs: {
    material: string | null;
    invented: boolean | null;
    toughness: EchoedValue;
    strength: EchoedValue;
    strainRate_per_s: number | null;
  };
  monteCarlo: { draws: number; seed: number } | null;
  warnings: Warning[];
}

function echo(q: QuantityInput | MaterialValue, unit: string, fallbackSource: string): EchoedValue {
  return {
    value: q.value,
    unit,
    sd: q.sd ?? null,
    interval95: q.interval ?? null,
    source: q.source ?? fallbackSource,
  };
}

function scatterOf(q: EchoedValue): Scatter | null {
  if (q.sd !== null && q.sd > 0) return { mean: q.value, sd: q.sd };
  if (q.interval95 !== null && q.interval95[1] > q.interval95[0]) return { lo: q.interval95[0], hi: q.interval95[1] };
  return null;
}

/**
 * Resolve the critical distance L (Taylor 2007: L = (1/π)(K_c/σ_0)²) from a material sheet entry
 * and/or typed values, with a seeded Monte Carlo 95 % interval when scatter is known.
 *
 * At a strain rate: L from the material's L law when present (no interval: sheet laws carry no fit
 * statistics); otherwise σ_0 from its σ_0 law with the static K_c.
 *
 * @param input material, typed values (MPa·√m, MPa), strain rate (1/s), seed, draws
 * @returns L in µm, the point/line/area distances in µm, the intervals and the inputs echoed with
 *   units and sources
 * @throws FractozoneError BAD_PARAMETER when a value is missing or invalid
 */
export function resolveCriticalDistance(input: ResolveInput): ResolvedDistance {
  const m = input.material;
  const kIn = input.toughness ?? m?.fractureToughness;
  const sIn = input.strength ?? m?.inherentStrength;
  if (!kIn) throw new FractozoneError('BAD_PARAMETER', 'fracture toughness is missing: give it directly or choose a material');
  if (!sIn) throw new FractozoneError('BAD_PARAMETER', 'inherent strength is missing: give it directly or choose a material');
  const fromMat = (q: unknown): string => (q !== undefined && m && (q === m.fractureToughness || q === m.inherentStrength) ? `material sheet` : 'command line');
  const toughness = echo(kIn, 'MPa·√m', fromMat(kIn));
  const strength = echo(sIn, 'MPa', fromMat(sIn));
  const warnings: Warning[] = [];
  const seed = input.seed ?? 1;
  const draws = input.draws ?? 20000;
  const base = {
    inputs: { material: m?.name ?? null, invented: m ? m.invented : null, toughness, strength, strainRate_per_s: input.strainRate ?? null },
  };
  if (m?.invented) warnings.push(warn('INVENTED_MATERIAL', `material "${m.name}" is invented demo data`));

  if (input.strainRate !== undefined) {
    const rate = input.strainRate;
    const dyn = m?.dynamic;
    if (!dyn || (!dyn.L && !dyn.sigma0)) {
      throw new FractozoneError('BAD_PARAMETER', m ? `material "${m.name}" has no strain-rate law; remove the strain rate or add "dynamic" to the sheet` : 'a strain rate needs a material with a strain-rate law');
    }
    if (dyn.L) {
      const r = evaluateRateLaw(dyn.L, rate, input.allowExtrapolation);
      if (r.warning) warnings.push(warn('RATE_EXTRAPOLATED', r.warning));
      let strengthEcho = strength;
      if (dyn.sigma0) {
        const s = evaluateRateLaw(dyn.sigma0, rate, input.allowExtrapolation);
        if (s.warning) warnings.push(warn('RATE_EXTRAPOLATED', s.warning));
        strengthEcho = { value: s.value, unit: 'MPa', sd: null, interval95: null, source: `${dyn.sigma0.source} (at ${rate} /s)` };
      }
      return {
        L_um: r.value,
        interval95_um: r.interval95,
        intervalNote: r.interval95 ? null : 'L has no interval: the law gives none (add sdA and sdB, or relSd, to the law in the material sheet)',
        median_um: null,
        deltaInterval95_um: null,
        ...methodDistances(r.value),
        basis: 'strain-rate law for L',
        inputs: { ...base.inputs, strength: strengthEcho },
        monteCarlo: null,
        warnings: [...warnings, warn('L_FROM_RATE_LAW', `L from the strain-rate law (${dyn.L.source}); the static toughness is not used`)],
      };
    }
    const s = evaluateRateLaw(dyn.sigma0 as NonNullable<typeof dyn.sigma0>, rate, input.allowExtrapolation);
    if (s.warning) warnings.push(warn('RATE_EXTRAPOLATED', s.warning));
    strength.value = s.value;
    // the law's interval as a normal sd of σ_0 (first order: sd ≈ value·sd_ln)
    strength.sd = s.sdLn ? s.value * s.sdLn : null;
    strength.interval95 = null;
    strength.source = `${(dyn.sigma0 as { source: string }).source} (at ${rate} /s)`;
    warnings.push(warn('SIGMA0_FROM_RATE_LAW', 'σ_0 from its strain-rate law with the static fracture toughness'));
  }

  const { L_um } = criticalDistance(toughness.value, strength.value);
  const sk = scatterOf(toughness);
  const ss = scatterOf(strength);
  let interval95_um: [number, number] | null = null;
  let median_um: number | null = null;
  let deltaInterval95_um: [number, number] | null = null;
  let monteCarlo: ResolvedDistance['monteCarlo'] = null;
  if (sk || ss) {
    const u = criticalDistanceUncertainty(sk ?? { mean: toughness.value, sd: 0 }, ss ?? { mean: strength.value, sd: 0 }, { seed, draws });
    interval95_um = u.interval95_um;
    median_um = u.median_um;
    deltaInterval95_um = u.deltaInterval95_um;
    monteCarlo = { draws: u.draws, seed: u.seed };
  }
  const why =
    input.strainRate !== undefined
      ? 'L has no interval: the σ_0 law gives none and the fracture toughness has no scatter'
      : 'L has no interval: neither the fracture toughness nor the inherent strength has a scatter (sd or interval)';
  return {
    L_um,
    interval95_um,
    intervalNote: interval95_um ? null : why,
    median_um,
    deltaInterval95_um,
    ...methodDistances(L_um),
    basis: input.strainRate !== undefined ? 'strain-rate law for σ_0' : 'static',
    ...base,
    monteCarlo,
    warnings,
  };
}
