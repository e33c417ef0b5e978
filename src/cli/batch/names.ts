/**
 * Output names: `results/<safe>.json`, `overlays/<safe>.png`. The safe name is the relative path
 * with folder separators turned into `__`, every character outside [A-Za-z0-9._-] turned into `_`,
 * no leading dot, at most 96 characters. When two inputs give the same name (case-insensitively,
 * for case-insensitive file systems) or the name was shortened, an 8-hex-digit hash of the root
 * index and relative path is appended. Deterministic for the same input list.
 */
import { createHash } from 'node:crypto';
import { safeFileName } from '../../core/text/safeName.js';
import type { InputImage } from './discover.js';

const MAX = 96;

export function sanitiseStem(rel: string): string {
  let s = safeFileName(rel.replace(/[\\/]+/g, '__'), 'each').replace(/^\.+/, '_');
  if (s === '') s = '_';
  return s;
}

function shortHash(s: string): string {
  return createHash('sha256').update(s).digest('hex').slice(0, 8);
}

/** Assigns unique safe names to a (full, sorted) input list; returns them in the same order. */
export function assignSafeNames(inputs: readonly InputImage[]): string[] {
  const base = inputs.map((i) => sanitiseStem(i.rel));
  const count = new Map<string, number>();
  for (const b of base) count.set(b.toLowerCase(), (count.get(b.toLowerCase()) ?? 0) + 1);
  const names = inputs.map((inp, k) => {
    const b = base[k];
    const needHash = (count.get(b.toLowerCase()) ?? 0) > 1 || b.length > MAX;
    if (!needHash) return b;
    return `${b.slice(0, MAX - 9)}-${shortHash(`${inp.root}\u0000${inp.rel}`)}`;
  });
  // A hashed name could still collide with a plain one (vanishingly unlikely): make it explicit.
  const seen = new Set<string>();
  return names.map((n) => {
    let m = n;
    let i = 2;
    while (seen.has(m.toLowerCase())) m = `${n}-${i++}`;
    seen.add(m.toLowerCase());
    return m;
  });
}
