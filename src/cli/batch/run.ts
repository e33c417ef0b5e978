/**
 * The `batch` run: discover → per-image settings → shard → resume check → worker pool → per-image
 * files (written atomically, overlay before result so a result file means "done") → summary files
 * rebuilt from the per-image files.
 *
 * Safety: nothing is written outside OUT; OUT may not be an input folder, contain an input folder
 * or an input file, or be an existing file. OUT inside an input folder is allowed and is skipped by
 * the discovery.
 */
import { existsSync, readdirSync, realpathSync, rmSync, statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { FractozoneError, isFractozoneError } from '../../core/errors.js';
import { canonicalJson, validateParams } from '../../core/pipeline/params.js';
import type { MeasureParams } from '../../core/pipeline/types.js';
import type { EntryStatus } from '../../core/report/csv.js';
import { TOOL_VERSION } from '../../core/version.js';
import { readInputFile, sha256Hex, toJsonText, writeFileAtomic } from '../io.js';
import { discoverImages, type InputImage } from './discover.js';
import { mergeSettings, readManifest, readSidecar, type ImageSettings, type Manifest } from './manifest.js';
import { MaterialResolver, materialName } from './material.js';
import { assignSafeNames } from './names.js';
import { ENTRY_SCHEMA, ERROR_SCHEMA, overlayPath, readRecord, rebuildOutputs, resultPath, thumbPath, writeBatchFile, type BatchBlock } from './outputs.js';
import { WorkerPool } from './pool.js';
import { processorModuleUrl } from './processor.js';
import { Progress, type ProgressCounts } from './progress.js';
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
    throw new FractozoneError('BAD_PARAMETER', `--out "${out}" is a file; give a folder`);
  }
  const outReal = real(out);
  for (const arg of inputs) {
    if (/[*?]/.test(arg)) continue;
    const a = resolve(arg);
    if (!existsSync(a)) continue;
    const ar = real(a);
    if (statSync(a).isDirectory()) {
      if (ar === outReal) throw new FractozoneError('BAD_PARAMETER', `--out "${out}" is an input folder; choose a separate output folder`);
      if (inside(ar, outReal)) throw new FractozoneError('BAD_PARAMETER', `input folder "${arg}" is inside the output folder "${out}"; choose a separate output folder`);
    } else if (inside(ar, outReal)) {
      throw new FractozoneError('BAD_PARAMETER', `input file "${arg}" is inside the output folder "${out}"`);
    }
  }
}

function applySettings(defaults: MeasureParams, s: ImageSettings, materialRef: string | undefined, materials: MaterialResolver): MeasureParams {
  const p = structuredClone(defaults);
  if (s.pixelSizeUm !== undefined) p.scale.pixelSizeUm = s.pixelSizeUm;
  if (s.barLengthUm !== undefined) p.scale.barLengthUm = s.barLengthUm;
  if (s.strainRatePerS !== undefined) p.strainRatePerS = s.strainRatePerS;
  const ref = s.material ?? materialRef;
  if (ref) p.material = materials.resolve(ref);
  return validateParams(p);
}

/** Temp files of writes cut short by a kill (`.<name>.<pid>.<n>.tmp`, see io.ts writeFileAtomic). */
function removeStaleTemps(out: string): void {
  for (const d of [out, join(out, 'results'), join(out, 'overlays'), join(out, 'thumbs')]) {
    if (!existsSync(d)) continue;
    for (const n of readdirSync(d)) if (/^\..+\.\d+\.\d+\.tmp$/.test(n)) rmSync(join(d, n), { force: true });
  }
}

const round3 = (v: number): number => Math.round(v * 1000) / 1000;
const cpuSeconds = (u: NodeJS.CpuUsage): number => (u.user + u.system) / 1e6;

async function eachLimited<T>(items: readonly T[], limit: number, fn: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  const runners = Array.from({ length: Math.min(limit, items.length) }, async () => {
    while (next < items.length) {
      const i = next++;
      await fn(items[i]);
    }
  });
  await Promise.all(runners);
}

/**
 * Runs a batch.
 * @returns the summary (counts and output files); failures are in the counts, not thrown
 * @throws FractozoneError for usage problems (bad OUT, no images, bad manifest) before any image is processed
 */
export async function runBatch(o: BatchOptions): Promise<BatchSummary> {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const out = resolve(o.out);
  let manifest: Manifest | null = null;
  if (o.manifest) manifest = readManifest(o.manifest);
  if (o.inputs.length === 0 && !manifest) {
    throw new FractozoneError('EMPTY_INPUT', 'give at least one folder, pattern or image file, or a --manifest listing the files', 'usage');
  }
  checkOut(out, o.inputs);

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
    for (const i of inputs) if (inside(real(i.abs), outReal)) throw new FractozoneError('BAD_PARAMETER', `input file "${i.rel}" is inside the output folder`);
  }
  if (inputs.length === 0) throw new FractozoneError('EMPTY_INPUT', 'no images found (extensions png, jpg, jpeg, tif, tiff)', 'usage');
  const names = assignSafeNames(inputs);
  const selected = inputs.map((inp, k) => ({ inp, safe: names[k], k })).filter((x) => inShard(x.k, o.shard));

  removeStaleTemps(out);
  writeBatchFile(out, o.defaults);
  const materials = new MaterialResolver();
  const counts: ProgressCounts = { done: 0, total: selected.length, ok: 0, noBand: 0, failed: 0, skipped: 0 };
  const progress = new Progress(process.stderr, o.progress);
  const jobs = Math.max(1, Math.min(o.jobs ?? availableParallelism(), Math.max(1, selected.length)));
  let pool: WorkerPool | null = null;
  const getPool = (): WorkerPool => (pool ??= new WorkerPool({ jobs, processorModule: processorModuleUrl(), workerMemoryMb: o.workerMemoryMb, imageTimeoutS: o.imageTimeoutS }));

  const finish = (status: EntryStatus | 'skipped'): void => {
    counts.done++;
    if (status === 'ok') counts.ok++;
    else if (status === 'no-band') counts.noBand++;
    else if (status === 'error') counts.failed++;
    else counts.skipped++;
    progress.update(counts);
  };

  const processOne = async ({ inp, safe }: { inp: InputImage; safe: string }): Promise<void> => {
    const block: BatchBlock = {
      schema: ENTRY_SCHEMA,
      file: inp.rel,
      safeName: safe,
      sha256: '',
      status: 'error',
      paramsSha256: '',
      metadata: {},
      strainRatePerS: o.defaults.strainRatePerS,
      material: materialName(o.defaults.material),
      overlay: null,
      thumbnail: null,
      settingsSource: 'defaults',
    };
    const writeError = (code: string, message: string): void => {
      block.status = 'error';
      block.overlay = null;
      block.thumbnail = null;
      writeFileAtomic(resultPath(out, safe), toJsonText({ schema: ERROR_SCHEMA, input: { file: inp.rel, sha256: block.sha256 }, error: { code, message }, batch: block }));
      finish('error');
    };
    let bytes: Uint8Array;
    let params: MeasureParams;
    try {
      bytes = readInputFile(inp.abs);
      block.sha256 = sha256Hex(bytes);
      const settings = mergeSettings(readSidecar(inp.abs), manifest?.rows.get(resolve(inp.abs)));
      block.metadata = settings.metadata;
      block.settingsSource = settings.source;
      params = applySettings(o.defaults, settings, o.defaultMaterial, materials);
      block.strainRatePerS = params.strainRatePerS;
      block.material = materialName(params.material);
      block.paramsSha256 = sha256Hex(new TextEncoder().encode(canonicalJson({ params, tool: TOOL_VERSION })));
    } catch (e) {
      if (!isFractozoneError(e)) throw e;
      writeError(e.code, e.message);
      return;
    }
    if (o.resume) {
      const prev = readRecord(resultPath(out, safe));
      if (
        prev &&
        prev.batch.status !== 'error' &&
        prev.batch.sha256 === block.sha256 &&
        prev.batch.paramsSha256 === block.paramsSha256 &&
        (prev.batch.overlay === null || existsSync(resolve(out, prev.batch.overlay))) &&
        (!prev.batch.thumbnail || existsSync(resolve(out, prev.batch.thumbnail)))
      ) {
        finish('skipped');
        return;
      }
    }
    const outcome = await getPool().run({ bytes, input: { file: inp.rel, sha256: block.sha256 }, params });
    if (!outcome.ok) {
      writeError(outcome.error.code, outcome.error.message);
      return;
    }
    const band = outcome.result.band as { detected?: boolean } | undefined;
    block.status = band && band.detected === false ? 'no-band' : 'ok';
    if (outcome.thumbnailPng) {
      writeFileAtomic(thumbPath(out, safe), outcome.thumbnailPng);
      block.thumbnail = `thumbs/${safe}.png`;
    }
    if (outcome.overlayPng) {
      writeFileAtomic(overlayPath(out, safe), outcome.overlayPng);
      block.overlay = `overlays/${safe}.png`;
    }
    writeFileAtomic(resultPath(out, safe), toJsonText({ ...outcome.result, batch: block }));
    finish(block.status);
  };

  try {
    progress.update(counts, true);
    await eachLimited(selected, jobs * 2, processOne);
  } finally {
    if (pool) await (pool as WorkerPool).close();
  }
  progress.update(counts, true);
  progress.end();
  rebuildOutputs(out, (m) => o.log(`batch: warning: ${m}`));
  return {
    schema: 'fractozone.batch-summary/1',
    out,
    total: counts.total,
    ok: counts.ok,
    noBand: counts.noBand,
    failed: counts.failed,
    skipped: counts.skipped,
    workersReplaced: pool ? (pool as WorkerPool).replaced : 0,
    files: { csv: 'results.csv', jsonl: 'results.jsonl', report: 'report.html' },
    timing: {
      wallS: round3((performance.now() - t0) / 1000),
      cpuS: round3(cpuSeconds(process.cpuUsage(c0)) + (pool ? (pool as WorkerPool).workerCpuS : 0)),
    },
  };
}
