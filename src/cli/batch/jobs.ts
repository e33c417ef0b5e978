/**
 * The image phase of a batch: per image, settings → resume check → worker pool → files written
 * atomically (thumbnail and overlay before the result, so a result file means "done"). Holds the
 * counts, the progress line and the stop state: an interrupt stops handing out images and lets the
 * running ones finish (killed after {@link INTERRUPT_GRACE_S}); a failed write (disk full, no
 * permission) stops everything at once and is re-thrown after the workers are gone.
 */
import { readModelFile } from '../model.js';
import { availableParallelism } from 'node:os';
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { isFractozoneError, type FractozoneError } from '../../core/errors.js';
import { canonicalJson, validateParams, type MeasureParams, type MeasureResult } from '../../core/pipeline/index.js';
import type { EntryStatus } from '../../core/report/csv.js';
import { TOOL_VERSION } from '../../core/version.js';
import { isWriteFailure, readInputFile, sha256Hex, TEMP_FILE_RE, toJsonText, writeFileAtomic } from '../io.js';
import type { InputImage } from './discover.js';
import { INTERRUPT_GRACE_S } from './interrupt.js';
import { mergeSettings, readSidecar, type ImageSettings, type Manifest } from './manifest.js';
import { MaterialResolver, materialName } from './material.js';
import { ENTRY_SCHEMA, ERROR_SCHEMA, overlayPath, readRecord, resultPath, thumbPath, type BatchBlock, type ErrorRecord, type ResultRecord } from './outputs.js';
import { WorkerPool, type PoolOutcome } from './pool.js';
import { processorModuleUrl } from './processor.js';
import { Progress, type ProgressCounts } from './progress.js';

/** One selected image and its output name. */
export interface JobItem {
  inp: InputImage;
  safe: string;
}

export interface JobOptions {
  out: string;
  manifest: Manifest | null;
  defaults: MeasureParams;
  defaultMaterial?: string;
  /** Model file from the command line (`--model`), the default for every image. */
  defaultModel?: string;
  resume: boolean;
  jobs?: number;
  workerMemoryMb?: number;
  imageTimeoutS?: number;
  progress: boolean;
  log: (line: string) => void;
}

/** What the image phase did. */
export interface JobsOutcome {
  counts: ProgressCounts;
  interrupted: boolean;
  workersReplaced: number;
  workerCpuS: number;
}

/** An image ready for the pool (bytes read, parameters resolved). */
interface Prepared {
  bytes: Uint8Array;
  params: MeasureParams;
  block: BatchBlock;
  model?: { path: string; sha256: string };
}

/** Temp files of writes cut short by a kill (`.<name>.<pid>.<n>.tmp`, see io.ts writeFileAtomic). */
export function removeStaleTemps(out: string): void {
  for (const d of [out, join(out, 'results'), join(out, 'overlays'), join(out, 'thumbs')]) {
    if (!existsSync(d)) continue;
    for (const n of readdirSync(d)) if (TEMP_FILE_RE.test(n)) rmSync(join(d, n), { force: true });
  }
}

function applySettings(defaults: MeasureParams, s: ImageSettings, materialRef: string | undefined, materials: MaterialResolver): MeasureParams {
  const p = structuredClone(defaults);
  if (s.pixelSizeUm !== undefined) p.scale.pixelSizeUm = s.pixelSizeUm;
  if (s.barLengthUm !== undefined) p.scale.barLengthUm = s.barLengthUm;
  if (s.sectionDiameterUm !== undefined) p.sectionDiameterUm = s.sectionDiameterUm;
  if (s.strainRatePerS !== undefined) p.strainRatePerS = s.strainRatePerS;
  const ref = s.material ?? materialRef;
  if (ref) p.material = materials.resolve(ref);
  return validateParams(p);
}

/** Runs `fn` over `items` with at most `limit` at once; stops handing out items once `stopped()`. */
async function eachLimited<T>(items: readonly T[], limit: number, fn: (item: T) => Promise<void>, stopped: () => boolean): Promise<void> {
  let next = 0;
  const runners = Array.from({ length: Math.min(limit, items.length) }, async () => {
    while (next < items.length && !stopped()) {
      const i = next++;
      await fn(items[i]);
    }
  });
  await Promise.all(runners);
}

export class BatchJobs {
  readonly counts: ProgressCounts;
  private readonly progress: Progress;
  private readonly materials = new MaterialResolver();
  private readonly jobs: number;
  private pool: WorkerPool | null = null;
  private stopReason: 'interrupt' | 'write-failed' | null = null;
  private writeError: FractozoneError | null = null;
  private graceTimer: ReturnType<typeof setTimeout> | null = null;

  constructor(
    private readonly o: JobOptions,
    total: number,
  ) {
    this.counts = { done: 0, total, ok: 0, noBand: 0, failed: 0, skipped: 0 };
    this.progress = new Progress(process.stderr, o.progress);
    this.jobs = Math.max(1, Math.min(o.jobs ?? availableParallelism(), Math.max(1, total)));
  }

  /** Processes the images (unless stopped first). @throws the first WRITE_FAILED error */
  async run(items: readonly JobItem[]): Promise<JobsOutcome> {
    try {
      this.progress.update(this.counts, true);
      await eachLimited(items, this.jobs * 2, (x) => this.processOne(x), () => this.stopReason !== null);
    } finally {
      if (this.graceTimer) clearTimeout(this.graceTimer);
      if (this.pool) await this.pool.close();
    }
    this.progress.update(this.counts, true);
    this.progress.end();
    if (this.writeError) throw this.writeError;
    return {
      counts: this.counts,
      interrupted: this.stopReason === 'interrupt',
      workersReplaced: this.pool?.replaced ?? 0,
      workerCpuS: this.pool?.workerCpuS ?? 0,
    };
  }

  /** First interrupt: no new images; running ones may finish within the grace period. */
  stopGracefully(signal: string): void {
    if (this.stopReason) return;
    this.stopReason = 'interrupt';
    this.pool?.stop();
    const running = this.pool?.running ?? 0;
    this.progress.end();
    this.o.log(
      `batch: ${signal} received: no new images; ${running} image(s) in progress may finish within ${INTERRUPT_GRACE_S} s (press Ctrl-C again to stop at once)`,
    );
    this.graceTimer = setTimeout(() => this.pool?.abort(), INTERRUPT_GRACE_S * 1000);
  }

  /** Second interrupt: kill the workers now (synchronous; the caller ends the process). */
  killNow(): void {
    this.progress.end();
    this.pool?.killAll();
  }

  private getPool(): WorkerPool {
    this.pool ??= new WorkerPool({
      jobs: this.jobs,
      processorModule: processorModuleUrl(),
      workerMemoryMb: this.o.workerMemoryMb,
      imageTimeoutS: this.o.imageTimeoutS,
    });
    return this.pool;
  }

  private finish(status: EntryStatus | 'skipped'): void {
    const c = this.counts;
    c.done++;
    if (status === 'ok') c.ok++;
    else if (status === 'no-band') c.noBand++;
    else if (status === 'error') c.failed++;
    else c.skipped++;
    this.progress.update(c);
  }

  private async processOne(item: JobItem): Promise<void> {
    try {
      const prepared = this.prepare(item);
      if (!prepared) return;
      if (this.o.resume && this.alreadyDone(item.safe, prepared.block)) {
        this.finish('skipped');
        return;
      }
      const outcome = await this.getPool().run({ bytes: prepared.bytes, input: { file: item.inp.rel, sha256: prepared.block.sha256, ...(prepared.model ? { model: prepared.model } : {}) }, params: prepared.params });
      this.record(item, prepared.block, outcome);
    } catch (e) {
      if (!isWriteFailure(e)) throw e;
      // disk full, no permission: stop everything; the error is thrown once the workers are gone
      this.writeError ??= e as FractozoneError;
      this.stopReason = 'write-failed';
      this.pool?.abort();
    }
  }

  /** Reads the image and resolves its settings; a failure is recorded and gives null. */
  private prepare({ inp, safe }: JobItem): Prepared | null {
    const o = this.o;
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
    try {
      const bytes = readInputFile(inp.abs);
      block.sha256 = sha256Hex(bytes);
      const settings = mergeSettings(readSidecar(inp.abs), o.manifest?.rows.get(resolve(inp.abs)));
      block.metadata = settings.metadata;
      block.settingsSource = settings.source;
      const params = applySettings(o.defaults, settings, o.defaultMaterial, this.materials);
      const modelPath = settings.model ?? o.defaultModel;
      const model = modelPath ? { path: modelPath, sha256: readModelFile(modelPath).sha256 } : undefined;
      if (model) params.modelSha256 = model.sha256;
      else delete params.modelSha256;
      block.strainRatePerS = params.strainRatePerS;
      block.material = materialName(params.material);
      block.paramsSha256 = sha256Hex(new TextEncoder().encode(canonicalJson({ params, tool: TOOL_VERSION })));
      return { bytes, params, block, model };
    } catch (e) {
      if (!isFractozoneError(e) || isWriteFailure(e)) throw e;
      this.recordFailure(safe, block, e.code, e.message);
      return null;
    }
  }

  /** The earlier result of this image is valid for the same image content and parameters. */
  private alreadyDone(safe: string, block: BatchBlock): boolean {
    const prev = readRecord(resultPath(this.o.out, safe));
    return Boolean(
      prev &&
        prev.batch.status !== 'error' &&
        prev.batch.sha256 === block.sha256 &&
        prev.batch.paramsSha256 === block.paramsSha256 &&
        (prev.batch.overlay === null || existsSync(resolve(this.o.out, prev.batch.overlay))) &&
        (!prev.batch.thumbnail || existsSync(resolve(this.o.out, prev.batch.thumbnail))),
    );
  }

  private record(item: JobItem, block: BatchBlock, outcome: PoolOutcome): void {
    if (outcome.kind === 'cancelled') return; // stopped: not done, a --resume run does it
    if (outcome.kind === 'failed') {
      this.recordFailure(item.safe, block, outcome.error.code, outcome.error.message);
      return;
    }
    this.writeDone(item.safe, block, outcome.result, outcome.overlayPng, outcome.thumbnailPng);
  }

  private writeDone(safe: string, block: BatchBlock, result: MeasureResult, overlayPng: Uint8Array | null, thumbnailPng: Uint8Array | null): void {
    const out = this.o.out;
    block.status = result.band && result.band.detected === false ? 'no-band' : 'ok';
    if (thumbnailPng) {
      writeFileAtomic(thumbPath(out, safe), thumbnailPng);
      block.thumbnail = `thumbs/${safe}.png`;
    }
    if (overlayPng) {
      writeFileAtomic(overlayPath(out, safe), overlayPng);
      block.overlay = `overlays/${safe}.png`;
    }
    const record: ResultRecord = { ...result, batch: block };
    writeFileAtomic(resultPath(out, safe), toJsonText(record));
    this.finish(block.status);
  }

  /** Records a failed image (error record file). */
  private recordFailure(safe: string, block: BatchBlock, code: string, message: string): void {
    block.status = 'error';
    block.overlay = null;
    block.thumbnail = null;
    const record: ErrorRecord = { schema: ERROR_SCHEMA, input: { file: block.file, sha256: block.sha256 }, error: { code, message }, batch: block };
    writeFileAtomic(resultPath(this.o.out, safe), toJsonText(record));
    this.finish('error');
  }
}
