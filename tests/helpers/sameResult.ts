/**
 * Compares two results (fractozone.result/1) as equal apart from the wall-clock diagnostics and
 * the specimen sizes that a recompute converts from rounded stored values (see
 * src/core/pipeline/recompute.ts): those must agree to relative 1e-5.
 */
import { expect } from 'vitest';

export const ROUNDED_FIELDS: string[][] = [
  ['specimen', 'radiusUm'],
  ['specimen', 'circle', 'radiusUm'],
  ['specimen', 'ellipse', 'semiMajorUm'],
  ['specimen', 'ellipse', 'semiMinorUm'],
  ['specimen', 'areaMm2'],
  ['specimen', 'equivalentRadiusUm'],
  ['resolved', 'windowUm'],
  ['scale', 'detectedBar', 'umPerPx'],
];

type Json = { [k: string]: unknown };

function parentOf(o: unknown, path: string[]): Json | null {
  let cur = o;
  for (const k of path.slice(0, -1)) cur = cur && typeof cur === 'object' ? (cur as Json)[k] : undefined;
  return cur && typeof cur === 'object' ? (cur as Json) : null;
}

export function expectSameResult(got: unknown, want: unknown, message?: string): void {
  const a = structuredClone(got) as Json;
  const b = structuredClone(want) as Json;
  delete a.diagnostics;
  delete b.diagnostics;
  for (const path of ROUNDED_FIELDS) {
    const pa = parentOf(a, path);
    const pb = parentOf(b, path);
    const key = path[path.length - 1];
    if (!pa || !pb || typeof pa[key] !== 'number' || typeof pb[key] !== 'number') continue;
    const va = pa[key] as number;
    const vb = pb[key] as number;
    expect(Math.abs(va - vb), `${path.join('.')}${message ? ` (${message})` : ''}`).toBeLessThanOrEqual(1e-5 * Math.abs(vb) + 1e-3);
    pa[key] = vb;
  }
  // the method variations kept by a re-measure are scaled from their rounded stored values
  // (src/core/pipeline/remeasure.ts), so the uncertainty block agrees to relative 1e-5
  const ua = (a.band as Json | undefined)?.uncertainty;
  const ub = (b.band as Json | undefined)?.uncertainty;
  if (ua && ub) {
    alignNumbers(ua, ub, 'band.uncertainty', message);
    (a.band as Json).uncertainty = ub;
  }
  expect(a, message).toEqual(b);
}

/**
 * Shares of the uncertainty budget are stored to 0.1 % (pipeline/stages/uncertainty.ts): recomputed
 * from the scaled variations, one that lies within 1e-5 of a rounding step can land on its other side.
 */
const TENTH_ROUNDED = /\.sharePct$/;

/** Every number of `a` within relative 1e-5 (+1e-3) of the same place in `b` (one 0.1 step for the shares); the rest equal. */
function alignNumbers(a: unknown, b: unknown, path: string, message?: string): void {
  if (typeof a === 'number' && typeof b === 'number') {
    const tol = TENTH_ROUNDED.test(path) ? 0.1 + 1e-9 : 1e-5 * Math.abs(b) + 1e-3;
    expect(Math.abs(a - b), `${path}${message ? ` (${message})` : ''}`).toBeLessThanOrEqual(tol);
    return;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    expect(Object.keys(a as Json).sort(), path).toEqual(Object.keys(b as Json).sort());
    for (const k of Object.keys(b as Json)) alignNumbers((a as Json)[k], (b as Json)[k], `${path}.${k}`, message);
    return;
  }
  expect(a, path).toEqual(b);
}
