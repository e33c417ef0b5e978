/**
 * The `batch` run: check OUT → take its lock → discover → shard → image phase (jobs.ts) →
 * summary files rebuilt from the per-image files → release the lock.
 *
 * Safety: nothing is written outside OUT; OUT may not be an input folder, contain an input folder
 * or an input file, or be an existing file. OUT inside an input folder is allowed and is skipped by
 * the discovery. One run at a time per OUT (lock.ts). SIGINT/SIGTERM stop gracefully (interrupt.ts):
 * the summary says `interrupted` and the command exits 130; a second signal aborts at once.
 */
import { readModelFile } from '../model.js';
import { existsSync, realpathSync, statSync } from 'node:fs';
import { dirname, relative, resolve, sep } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import type { MeasureParams } from '../../core/pipeline/index.js';
import { printable } from '../../core/text/printable.js';
import { discoverImages, type InputImage } from './discover.js';
import { INTERRUPTED_EXIT_CODE, InterruptWatch } from './interrupt.js';
import { BatchJobs, removeStaleTemps, type JobItem } from './jobs.js';
import { acquireOutputLock, type OutputLock } from './lock.js';
import { readManifest, type Manifest } from './manifest.js';
import { assignSafeNames } from './names.js';
import { rebuildOutputs, writeBatchFile } from './outputs.js';
import { inShard, type Shard } from './shard.js';

export interface BatchOptions {
  /** Folders, glob patterns or files; may be empty when a manifest lists the files. */
  inputs: string[];
  out: string;
  manifest?: string;
  jobs?: number;
  resume: boolean;
  shard: Shard | null;
  /** Batch defaults (from the measure options). */
  defaults: MeasureParams;
  /** Material reference from the command line (`SHEET:NAME`), the default for every image. */
  defaultMaterial?: string;
  /** Model file from the command line (`--model`), the default for every image. */
  defaultModel?: string;
  workerMemoryMb?: number;
  /** Longest time one image may take, s (undefined: no limit). */
  imageTimeoutS?: number;
  progress: boolean;
  log: (line: string) => void;
}

export interface BatchSummary {
  schema: 'fractozone.batch-summary/1';
  out: string;
  total: number;
  ok: number;
  noBand: number;
  failed: number;
  skipped: number;
  /** True when SIGINT/SIGTERM stopped the run before every image was done (exit 130). */
  interrupted: boolean;
  workersReplaced: number;
  files: { csv: string; jsonl: string; report: string };
  /** Wall-clock and CPU seconds of the whole run (CPU of this process plus what the worker processes reported). */
  timing: { wallS: number; cpuS: number };
}

function real(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return resolve(p);
  }
}

function inside(child: string, parent: string): boolean {
  const r = relative(parent, child);
  return r === '' || (!r.startsWith('..') && !r.startsWith(sep) && r !== '..' && !/^[A-Za-z]:/.test(r));
}

function checkOut(out: string, inputs: readonly string[]): void {
  if (existsSync(out) && !statSync(out).isDirectory()) {
    throw new FractozoneError('BAD_PARAMETER', `--out "${printable(out)}" is a file; give a folder`);
  }
  const outReal = real(out);
  for (const arg of inputs) {
    if (/[*?]/.test(arg)) continue;
    const a = resolve(arg);
    if (!existsSync(a)) continue;
    const ar = real(a);
    if (statSync(a).isDirectory()) {
      if (ar === outReal) throw new FractozoneError('BAD_PARAMETER', `--out "${printable(out)}" is an input folder; choose a separate output folder`);
      if (inside(ar, outReal)) throw new FractozoneError('BAD_PARAMETER', `input folder "${printable(arg)}" is inside the output folder "${printable(out)}"; choose a separate output folder`);
    } else if (inside(ar, outReal)) {
      throw new FractozoneError('BAD_PARAMETER', `input file "${printable(arg)}" is inside the output folder "${printable(out)}"`);
    }
  }
}

/** The images of the run: discovered (or listed by the manifest), named, sharded. */
function selectImages(o: BatchOptions, out: string, manifest: Manifest | null): JobItem[] {
  let inputs: InputImage[];
  if (o.inputs.length > 0) {
    inputs = discoverImages(o.inputs, [out]);
    if (manifest) {
      const have = new Set(inputs.map((i) => resolve(i.abs)));
      const unused = [...manifest.rows].filter(([abs]) => !have.has(abs));
      if (unused.length > 0) {
        const [abs, s] = unused[0];
        o.log(`batch: note: ${unused.length} manifest row(s) name images that are not among the inputs and are ignored (first: ${s.source}, "${relative(process.cwd(), abs)}")`);
      }
    }
  } else {
    const base = dirname(manifest!.path);
    inputs = [...manifest!.rows.keys()]
      .map((abs) => ({ abs, rel: relative(base, abs).split(sep).join('/'), root: 0 }))
      .sort((a, b) => (a.rel < b.rel ? -1 : a.rel > b.rel ? 1 : 0));
    const outReal = real(out);
    for (const i of inputs) if (inside(real(i.abs), outReal)) throw new FractozoneError('BAD_PARAMETER', `input file "${printable(i.rel)}" is inside the output folder`);
  }
  if (inputs.length === 0) throw new FractozoneError('EMPTY_INPUT', 'no images found (extensions png, jpg, jpeg, tif, tiff)', 'usage');
  const names = assignSafeNames(inputs);
  return inputs.map((inp, k) => ({ inp, safe: names[k], k })).filter((x) => inShard(x.k, o.shard));
}

const round3 = (v: number): number => Math.round(v * 1000) / 1000;
const cpuSeconds = (u: NodeJS.CpuUsage): number => (u.user + u.system) / 1e6;

/** Interrupt handling for the whole run: graceful stop of the image phase, or an immediate abort. */
function watchInterrupts(o: BatchOptions, out: string, state: { jobs: BatchJobs | null; lock: OutputLock | null }): InterruptWatch {
  return new InterruptWatch({
    graceful: (signal) => state.jobs?.stopGracefully(signal),
    immediate: () => {
      state.jobs?.killNow();
      removeStaleTemps(out);
      state.lock?.release();
      const c = state.jobs?.counts;
      o.log(`interrupted: stopped at once; ${c ? `${c.done} of ${c.total}` : 'no images'} done; run again with --resume`);
      process.exit(INTERRUPTED_EXIT_CODE);
    },
  });
}

/**
 * Runs a batch.
 * @returns the summary (counts and output files); failures are in the counts, not thrown
 * @throws FractozoneError for usage problems (bad OUT, no images, bad manifest) before any image
 *   is processed, OUTPUT_BUSY when another run holds OUT, WRITE_FAILED when OUT cannot be written
 */
export async function runBatch(o: BatchOptions): Promise<BatchSummary> {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const out = resolve(o.out);
  const manifest = o.manifest ? readManifest(o.manifest) : null;
  if (o.inputs.length === 0 && !manifest) {
    throw new FractozoneError('EMPTY_INPUT', 'give at least one folder, pattern or image file, or a --manifest listing the files', 'usage');
  }
  checkOut(out, o.inputs);
  // every model the run names is read and checked before anything is written (BAD_MODEL, exit 2)
  for (const m of [o.defaultModel, ...[...(manifest?.rows.values() ?? [])].map((r) => r.model)]) if (m) readModelFile(m);
  const state: { jobs: BatchJobs | null; lock: OutputLock | null } = { jobs: null, lock: null };
  const watch = watchInterrupts(o, out, state).install();
  try {
    state.lock = acquireOutputLock(out, 'batch', (m) => o.log(`batch: ${m}`));
    const selected = selectImages(o, out, manifest);
    removeStaleTemps(out);
    writeBatchFile(out, o.defaults);
    state.jobs = new BatchJobs({ ...o, out, manifest }, selected.length);
    if (watch.signal) state.jobs.stopGracefully(watch.signal);
    const done = await state.jobs.run(selected);
    rebuildOutputs(out, (m) => o.log(`batch: warning: ${m}`));
    const c = done.counts;
    return {
      schema: 'fractozone.batch-summary/1',
      out,
      total: c.total,
      ok: c.ok,
      noBand: c.noBand,
      failed: c.failed,
      skipped: c.skipped,
      interrupted: done.interrupted,
      workersReplaced: done.workersReplaced,
      files: { csv: 'results.csv', jsonl: 'results.jsonl', report: 'report.html' },
      timing: { wallS: round3((performance.now() - t0) / 1000), cpuS: round3(cpuSeconds(process.cpuUsage(c0)) + done.workerCpuS) },
    };
  } finally {
    watch.uninstall();
    state.lock?.release();
  }
}
