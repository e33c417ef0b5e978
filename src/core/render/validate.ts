/** Small validators of render options: each throws BAD_PARAMETER with one sentence naming the option and its unit. */
import { FractozoneError } from '../errors.js';
import type { Harmonic } from './options.js';
import type { Tint } from './sceneOptions.js';

/** Throw BAD_PARAMETER with `msg`. */
export function bad(msg: string): never {
  throw new FractozoneError('BAD_PARAMETER', msg);
}

/** A finite number in [lo, hi] (optionally whole). */
export function num(v: unknown, what: string, lo: number, hi: number, integer = false): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) bad(`${what} must be a finite number, got ${String(v)}`);
  if (v < lo || v > hi) bad(`${what} must be between ${lo} and ${hi}, got ${v}`);
  if (integer && !Number.isInteger(v)) bad(`${what} must be a whole number, got ${v}`);
  return v;
}

/** One of the allowed strings. */
export function oneOf<T extends string>(v: unknown, what: string, allowed: readonly T[]): T {
  if (typeof v !== 'string' || !(allowed as readonly string[]).includes(v)) bad(`${what} must be ${allowed.join(', ')}, got "${String(v)}"`);
  return v as T;
}

/** A list of harmonics (the fallback when not given). */
export function harmonics(list: readonly Harmonic[] | undefined, what: string, fallback: readonly Harmonic[]): Harmonic[] {
  const l = list ?? fallback;
  if (!Array.isArray(l)) bad(`${what} must be a list of {order, amplitudePct, phaseDeg}`);
  return l.map((h, i) => ({
    order: num(h?.order, `${what}[${i}].order`, 1, 360, true),
    amplitudePct: num(h?.amplitudePct, `${what}[${i}].amplitudePct (%)`, -100, 100),
    phaseDeg: num(h?.phaseDeg ?? 0, `${what}[${i}].phaseDeg (°)`, -3600, 3600),
  }));
}

/** An RGB multiplier triple, each in [0, 3]. */
export function tint(v: unknown, what: string): Tint {
  if (!Array.isArray(v) || v.length !== 3) bad(`${what} must be three numbers [red, green, blue], got ${JSON.stringify(v)}`);
  return [num(v[0], `${what} red`, 0, 3), num(v[1], `${what} green`, 0, 3), num(v[2], `${what} blue`, 0, 3)];
}

/** A plain printable text (the bitmap font's characters), at most `max` characters. */
export function text(v: unknown, what: string, max: number): string {
  if (typeof v !== 'string') bad(`${what} must be text, got ${String(v)}`);
  if (v.length > max) bad(`${what} must be at most ${max} characters long, got ${v.length}`);
  return v;
}
