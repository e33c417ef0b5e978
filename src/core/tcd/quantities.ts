/**
 * Units for the critical-distance maths: fracture toughness (MPa·√m), stress (MPa), distance (m),
 * load (N or MPa nominal stress). Imperial factors are exact by definition:
 * 1 lbf = 4.4482216152605 N and 1 in = 0.0254 m (NIST SP 811, 2008, appendix B), so
 * 1 ksi = 1000 lbf/in² = 6.894757293168361 MPa and 1 ksi·√in = 6.894757293168361·√0.0254 MPa·√m
 * ≈ 1.098843 MPa·√m (the conversion factor quoted in ASTM E399).
 */
import { FractozoneError } from '../errors.js';

/** MPa in one ksi (exact: 4.4482216152605 N × 1000 / 0.0254² m², NIST SP 811). */
export const MPA_PER_KSI = (4.4482216152605 * 1000) / (0.0254 * 0.0254) / 1e6;
/** MPa·√m in one ksi·√in (exact product, NIST SP 811 definitions). */
export const MPA_SQRTM_PER_KSI_SQRTIN = MPA_PER_KSI * Math.sqrt(0.0254);

/** Normalise a unit string: drop spaces, unify the micro sign, multiplication dots and roots. */
function normUnit(u: string): string {
  return u
    .trim()
    .replace(/\s+/g, '')
    .replace(/[μ]/g, 'µ')
    .replace(/[·⋅×]/g, '*')
    .replace(/√\(?([a-zA-Z]+)\)?/g, 'sqrt($1)')
    .replace(/\^\(?1\/2\)?|\^0\.5|\^½/g, '^0.5')
    .toLowerCase();
}

const STRESS_TO_MPA: Record<string, number> = {
  mpa: 1,
  'n/mm2': 1,
  'n/mm^2': 1,
  gpa: 1000,
  kpa: 1e-3,
  pa: 1e-6,
  ksi: MPA_PER_KSI,
  psi: MPA_PER_KSI / 1000,
};

const TOUGHNESS_TO_MPA_SQRTM: Record<string, number> = {};
for (const form of ['mpa*sqrt(m)', 'mpasqrt(m)', 'mpa*m^0.5', 'mpam^0.5', 'mn/m^1.5', 'mn*m^-1.5', 'mn*m^-3/2', 'mn/m^(3/2)', 'mn/m^3/2']) {
  TOUGHNESS_TO_MPA_SQRTM[form] = 1;
}
for (const form of ['ksi*sqrt(in)', 'ksisqrt(in)', 'ksi*in^0.5', 'ksiin^0.5']) {
  TOUGHNESS_TO_MPA_SQRTM[form] = MPA_SQRTM_PER_KSI_SQRTIN;
}
for (const form of ['pa*sqrt(m)', 'pasqrt(m)', 'pa*m^0.5']) TOUGHNESS_TO_MPA_SQRTM[form] = 1e-6;

const DISTANCE_TO_M: Record<string, number> = {
  m: 1,
  mm: 1e-3,
  um: 1e-6,
  'µm': 1e-6,
  micron: 1e-6,
  nm: 1e-9,
  in: 0.0254,
};

const FORCE_TO_N: Record<string, number> = {
  n: 1,
  kn: 1e3,
  mn: 1e6,
  lbf: 4.4482216152605,
  kip: 4448.2216152605,
  kgf: 9.80665,
};

/** What a unit measures. */
export type Dimension = 'stress' | 'toughness' | 'distance' | 'force';

/** Factor that turns a value in `unit` into the engine unit of its dimension, or undefined. */
export function unitFactor(unit: string, dimension: Dimension): number | undefined {
  const u = normUnit(unit);
  switch (dimension) {
    case 'stress':
      return STRESS_TO_MPA[u];
    case 'toughness':
      return TOUGHNESS_TO_MPA_SQRTM[u];
    case 'distance':
      return DISTANCE_TO_M[u] ?? DISTANCE_TO_M[unit.trim()];
    case 'force':
      // "MN" (meganewton) collides with nothing else in the force table; keep case-insensitive
      return FORCE_TO_N[u];
  }
}

const UNIT_HINT: Record<Dimension, string> = {
  stress: 'MPa, GPa, Pa, ksi or psi',
  toughness: 'MPa*sqrt(m) or ksi*sqrt(in)',
  distance: 'm, mm, um/µm or in',
  force: 'N, kN, MN, lbf or kip',
};
const ENGINE_UNIT: Record<Dimension, string> = { stress: 'MPa', toughness: 'MPa·√m', distance: 'm', force: 'N' };

/**
 * Convert `value` given in `unit` to the engine unit of `dimension` (MPa, MPa·√m, m, N).
 * @throws FractozoneError BAD_PARAMETER for an unknown unit (message names `what`).
 */
export function toEngineUnit(value: number, unit: string, dimension: Dimension, what: string): number {
  const f = unitFactor(unit, dimension);
  if (f === undefined) {
    throw new FractozoneError('BAD_PARAMETER', `${what}: unknown unit "${unit}" (use ${UNIT_HINT[dimension]})`);
  }
  return value * f;
}

/** Unit system used for bare numbers typed by a user. */
export type UnitSystem = 'si' | 'imperial';

/**
 * Parse a positive quantity typed by a user: "60", "60MPa*sqrt(m)", "60 MPa√m", "130ksi", "0.9GPa".
 * A bare number takes the default unit of `system` (si: MPa / MPa·√m; imperial: ksi / ksi·√in).
 * @param text the typed text
 * @param dimension 'stress' or 'toughness'
 * @param what a name for messages, e.g. "--toughness"
 * @param system unit system for bare numbers
 * @param allowZero accept 0 (for standard deviations)
 * @returns the value in MPa or MPa·√m
 */
export function parseQuantity(
  text: string,
  dimension: 'stress' | 'toughness',
  what: string,
  system: UnitSystem = 'si',
  allowZero = false,
): number {
  const s = String(text).trim();
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(s);
  if (!m) {
    const ex = dimension === 'stress' ? '900MPa or 130ksi' : '60MPa*sqrt(m) or 55ksi*sqrt(in)';
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not a number with an optional unit (e.g. ${ex})`);
  }
  const value = Number(m[1]);
  const unit =
    m[2] !== '' ? m[2] : dimension === 'stress' ? (system === 'si' ? 'MPa' : 'ksi') : system === 'si' ? 'MPa*sqrt(m)' : 'ksi*sqrt(in)';
  const v = toEngineUnit(value, unit, dimension, `${what} "${text}"`);
  if (!Number.isFinite(v) || v < 0 || (!allowZero && v === 0)) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be a ${allowZero ? 'non-negative' : 'positive'} finite ${dimension === 'stress' ? 'stress' : 'toughness'}`);
  }
  return v;
}

/** A load: a force (N) or a nominal stress (MPa). */
export interface Load {
  value: number;
  dimension: 'force' | 'stress';
  /** Engine unit of `value`: 'N' or 'MPa'. */
  unit: 'N' | 'MPa';
}

/**
 * Parse a load with its unit: "12.5kN", "9100N", "2.8kip" (force) or "250MPa", "36ksi" (nominal stress).
 * @throws FractozoneError BAD_PARAMETER for a missing/unknown unit or a non-positive value.
 */
export function parseLoad(text: string, what: string): Load {
  const s = String(text).trim();
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(s);
  if (!m) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not a number with a unit (e.g. 12.5kN or 250MPa)`);
  const value = Number(m[1]);
  if (m[2] === '') throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" has no unit; write e.g. ${m[1]}kN or ${m[1]}MPa`);
  const fF = unitFactor(m[2], 'force');
  const fS = unitFactor(m[2], 'stress');
  // "MN" is meganewton (force); "MPa" is stress; no unit is in both tables except by case, force wins for N-units
  if (fF === undefined && fS === undefined) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}": unknown unit "${m[2]}" (use ${UNIT_HINT.force}, or MPa/ksi for a nominal stress)`);
  }
  if (!Number.isFinite(value) || value <= 0) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be positive`);
  return fF !== undefined ? { value: value * fF, dimension: 'force', unit: 'N' } : { value: value * (fS as number), dimension: 'stress', unit: 'MPa' };
}

/** Engine unit names for display. */
export const ENGINE_UNITS = ENGINE_UNIT;
