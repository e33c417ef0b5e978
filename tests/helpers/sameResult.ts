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
  expect(a, message).toEqual(b);
}
