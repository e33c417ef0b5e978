/**
 * Physical units. Lengths inside the engine are µm (micrometres) unless a name says px.
 * Branded number types keep pixel and micrometre values from being mixed by accident.
 */
import { FractozoneError } from '../errors.js';

export type Px = number & { readonly __unit: 'px' };
export type Um = number & { readonly __unit: 'um' };

export const px = (v: number): Px => v as Px;
export const um = (v: number): Um => v as Um;

const LENGTH_TO_UM: Record<string, number> = {
  nm: 1e-3,
  um: 1,
  'µm': 1,
  'μm': 1, // Greek mu (U+03BC) as well as micro sign (U+00B5)
  micron: 1,
  microns: 1,
  mm: 1e3,
  cm: 1e4,
  m: 1e6,
  in: 25400,
};

/** Units accepted for a length typed by a user, in the order shown in messages. */
export const LENGTH_UNITS = ['nm', 'um', 'µm', 'mm'] as const;

/**
 * Parse a length such as "4um", "4 µm", "0.5mm", "350nm" into micrometres.
 * A bare number is refused unless `defaultUnit` is given: a silent unit guess is a wrong number.
 */
export function parseLengthUm(text: string, what = 'length', defaultUnit?: 'nm' | 'um' | 'mm'): number {
  const s = String(text).trim();
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([a-zA-Zµμ]*)$/.exec(s);
  if (!m) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not a number with a unit (e.g. 4um, 0.5mm, 350nm)`);
  }
  const value = Number(m[1]);
  const unit = m[2] === '' ? defaultUnit : m[2];
  if (unit === undefined) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" has no unit; write e.g. ${m[1]}um or ${m[1]}mm`);
  }
  const f = LENGTH_TO_UM[unit] ?? LENGTH_TO_UM[unit.toLowerCase()];
  if (f === undefined) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}": unknown unit "${unit}" (use nm, um, µm or mm)`);
  }
  if (!Number.isFinite(value) || value <= 0) {
    throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be a positive finite length`);
  }
  return value * f;
}

/** Format a length in µm with a sensible unit for display. */
export function formatLengthUm(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return String(v);
  if (Math.abs(v) >= 1000) return `${(v / 1000).toPrecision(digits)} mm`;
  if (Math.abs(v) < 1 && v !== 0) return `${(v * 1000).toPrecision(digits)} nm`;
  return `${v.toPrecision(digits)} µm`;
}
