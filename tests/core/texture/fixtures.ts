/** Loads the reference fixtures written by scripts/fixtures/make_texture_fixtures.py. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { createRaster, type GrayRaster } from '../../../src/core/image/raster.js';

const DIR = fileURLToPath(new URL('../../fixtures/texture/', import.meta.url));

interface Entry {
  dtype: 'uint8' | 'float32';
  width: number;
  height: number;
}
interface Manifest {
  width: number;
  height: number;
  files: Record<string, Entry>;
}

export const manifest: Manifest = JSON.parse(readFileSync(DIR + 'manifest.json', 'utf8')) as Manifest;

export function loadU8(name: string): { data: Uint8Array; width: number; height: number } {
  const e = manifest.files[name];
  const b = readFileSync(DIR + name);
  return { data: new Uint8Array(b.buffer, b.byteOffset, b.byteLength).slice(), width: e.width, height: e.height };
}

export function loadF32(name: string): GrayRaster {
  const e = manifest.files[name];
  const b = readFileSync(DIR + name);
  const copy = new Uint8Array(b.byteLength);
  copy.set(b);
  return createRaster(e.width, e.height, new Float32Array(copy.buffer));
}

/** The fixture input as a 0..1 raster (value / 255). */
export function inputRaster(): GrayRaster {
  const u = loadU8('input_u8.bin');
  const f = new Float32Array(u.data.length);
  for (let i = 0; i < f.length; i++) f[i] = u.data[i] / 255;
  return createRaster(u.width, u.height, f);
}

export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} ≠ ${b.length}`);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

export function maxOf(a: ArrayLike<number>): number {
  let m = -Infinity;
  for (let i = 0; i < a.length; i++) m = Math.max(m, a[i]);
  return m;
}

/** Seeded pseudo-random levels 0..levels − 1 (linear congruential, Numerical Recipes constants). */
export function seeded(n: number, seed: number, levels: number): Uint8Array {
  let a = seed >>> 0;
  const v = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    a = (Math.imul(a, 1664525) + 1013904223) >>> 0;
    v[i] = Math.floor((a / 4294967296) * levels);
  }
  return v;
}
