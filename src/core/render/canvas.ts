/**
 * Working state of one render: the per-pixel planes every pass reads or writes, the seeded noise
 * tables (forked from the master stream in a fixed order — the order decides the image bytes), and
 * the specimens placed in the frame.
 */
import { createRng, type Rng } from '../random.js';
import type { Geometry } from './geometry.js';
import { makeNoiseTable, type NoiseTable } from './noise.js';
import type { ResolvedRenderOptions } from './options.js';

/** Per-pixel planes (row-major, W × H). */
export interface Canvas {
  readonly W: number;
  readonly H: number;
  readonly n: number;
  /** height field of the fracture surface, µm (toward the viewer) */
  readonly height: Float32Array;
  /** rim weight m: 0 core … 1 rim */
  readonly blend: Float32Array;
  /** signed distance to the fracture surface outline, px (+ inside) */
  readonly edge: Float32Array;
  /** shaded fracture surface, then the composite */
  readonly out: Float32Array;
  /** neutral specular light on the fracture surface (glints), or null when there is none */
  spec: Float32Array | null;
}

/** The seeded noise tables and streams of a render. */
export interface Tables {
  readonly core: NoiseTable;
  readonly dimple: NoiseTable;
  readonly ridge: NoiseTable;
  readonly rim: NoiseTable;
  readonly background: NoiseTable;
  readonly crackSeed: number;
  /** pixel noise */
  readonly noise: Rng;
  /** seed of the scene elements' streams (forked last, so the streams above are those of a plain render) */
  readonly sceneSeed: number;
}

/** One fracture surface in the frame and the columns its passes cover (two halves split the frame). */
export interface SpecimenLayer {
  readonly index: number;
  readonly g: Geometry;
  /** columns x0 ≤ x < x1 belong to this specimen */
  readonly x0: number;
  readonly x1: number;
}

/** Allocate the planes of a W × H render. */
export function createCanvas(W: number, H: number): Canvas {
  const n = W * H;
  return { W, H, n, height: new Float32Array(n), blend: new Float32Array(n), edge: new Float32Array(n), out: new Float32Array(n), spec: null };
}

/** Fork the tables from the master stream of `o.seed` (sfc32; the fork order is part of the image bytes). */
export function createTables(o: ResolvedRenderOptions): Tables {
  const master = createRng(o.seed, 'sfc32');
  const core = makeNoiseTable(master.fork('core'));
  const dimple = makeNoiseTable(master.fork('dimple'));
  const ridge = makeNoiseTable(master.fork('ridge'));
  const rim = makeNoiseTable(master.fork('rim'));
  const background = makeNoiseTable(master.fork('background'));
  const crackSeed = master.fork('cracks').int(2 ** 31);
  const noise = master.fork('noise');
  const sceneSeed = master.fork('scene').int(2 ** 32);
  return { core, dimple, ridge, rim, background, crackSeed, noise, sceneSeed };
}

/** Index into a LUT of 7200 + 1 entries at specimen angle (X, Y): integer part and fraction. */
export function lutPos(X: number, Y: number): { li: number; lt: number } {
  let al = Math.atan2(Y, X);
  if (al < 0) al += 2 * Math.PI;
  let f = al * (7200 / (2 * Math.PI));
  if (f >= 7200) f -= 7200;
  const li = f | 0;
  return { li, lt: f - li };
}
