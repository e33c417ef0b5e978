/**
 * Material inputs → core's MaterialParams, and what is missing before a critical distance can be
 * computed (said in the app's words, beside the material form).
 */
import type { Material, MaterialParams, MaterialValue, MeasureParams, QuantityInput } from '../../core/index.js';
import { emptyMaterial, type MaterialForm, type TypedValue } from './document.js';

/** Source recorded for values typed in the app (echoed in the result). */
export const TYPED_SOURCE = 'typed in the app';
/** Name of the material record built from typed values when a typed rate law needs one. */
export const TYPED_MATERIAL = 'typed in the app';

/** The material chosen from the sheet, or null. */
export function sheetMaterial(m: MaterialForm): Material | null {
  return m.sheet?.materials.find((x) => x.name === m.sheet?.chosen) ?? null;
}

function quantity(v: TypedValue): QuantityInput {
  return v.sd !== null ? { value: v.value, sd: v.sd, source: TYPED_SOURCE } : { value: v.value, source: TYPED_SOURCE };
}

function value(v: TypedValue, unitWritten: string): MaterialValue {
  return v.sd !== null ? { value: v.value, sd: v.sd, unitWritten, source: TYPED_SOURCE } : { value: v.value, unitWritten, source: TYPED_SOURCE };
}

/** The typed rate law when both A and B are given. */
export function typedLaw(m: MaterialForm): { A: number; B: number } | null {
  const l = m.rateLaw;
  return l && l.A !== null && l.B !== null ? { A: l.A, B: l.B } : null;
}

/** True when a strain-rate law is available (typed, or in the chosen sheet material). */
export function hasRateLaw(m: MaterialForm): boolean {
  const d = sheetMaterial(m)?.dynamic;
  return typedLaw(m) !== null || Boolean(d?.L || d?.sigma0);
}

/**
 * What keeps the material inputs from giving a critical distance at this strain rate, in one
 * sentence for the material form; null when they are complete (or empty: no comparison wanted).
 */
export function materialProblem(m: MaterialForm, strainRatePerS: number | null): string | null {
  const sheet = sheetMaterial(m);
  const k = m.toughness ?? sheet?.fractureToughness ?? null;
  const s = m.strength ?? sheet?.inherentStrength ?? null;
  const anything = sheet !== null || m.toughness !== null || m.strength !== null || m.rateLaw !== null;
  if (!anything) return null;
  if (!k || !s) return 'Type both the fracture toughness K_c and the inherent strength σ₀ (or read a material sheet) to compute L.';
  if (m.rateLaw && typedLaw(m) === null) return 'Type both A and B of the rate law L = A·ε̇^B (or clear both).';
  if (strainRatePerS !== null && !hasRateLaw(m)) {
    return 'A strain rate needs a strain-rate law: type A and B of L = A·ε̇^B, read a material sheet that has one, or clear the strain rate. No comparison with L until then.';
  }
  return null;
}

/** The material parameters for the engine, or null when there is nothing (complete) to compare with. */
export function materialParamsOf(m: MaterialForm, strainRatePerS: number | null): MaterialParams | null {
  if (materialProblem(m, strainRatePerS) !== null) return null;
  const sheet = sheetMaterial(m);
  if (!sheet && !m.toughness && !m.strength) return null;
  const out: MaterialParams = {};
  if (m.toughness) out.toughness = quantity(m.toughness);
  if (m.strength) out.strength = quantity(m.strength);
  if (sheet) out.material = sheet;
  const typed = m.toughness && m.strength ? { name: TYPED_MATERIAL, invented: false, fractureToughness: value(m.toughness, 'MPa·√m'), inherentStrength: value(m.strength, 'MPa') } : null;
  const base: Material | null = sheet ?? typed;
  const law = typedLaw(m);
  if (law && base) out.material = { ...base, dynamic: { ...base.dynamic, L: { law: 'power', A: law.A, B: law.B, source: TYPED_SOURCE } } };
  return out;
}

const typedOf = (q: QuantityInput | undefined): TypedValue | null => (q ? { value: q.value, sd: q.sd ?? null } : null);

/** Material inputs from a parameter object (reopening a session). */
export function materialFormOf(p: MeasureParams, sessionFile: string): MaterialForm {
  const m = p.material;
  const form: MaterialForm = { ...emptyMaterial(), reference: p.reference, tolerancePct: p.tolerancePct };
  if (!m) return form;
  form.toughness = typedOf(m.toughness);
  form.strength = typedOf(m.strength);
  const mat = m.material;
  if (!mat) return form;
  const law = mat.dynamic?.L;
  if (mat.name === TYPED_MATERIAL) {
    if (law?.law === 'power') form.rateLaw = { A: law.A, B: law.B };
    return form;
  }
  form.sheet = { file: sessionFile, materials: [mat], chosen: mat.name };
  return form;
}
