/**
 * A fixed-size pool of batch worker processes (node:child_process `fork`, structured-clone IPC).
 * Each worker loads OpenCV and the processor once and is started with V8's `--single-threaded`
 * (no background compiler or garbage-collector threads), so `--jobs N` keeps N cores busy and
 * no more: measured on 2 cores with 16 × 4-MP images, 2 workers finish 14 % sooner this way than
 * as worker threads of one process with V8's helper threads competing for the same cores (1 worker
 * is ≈ 5 % slower; see DEVELOPERS.md, performance notes). A worker whose parent disappears (the
 * batch was killed) exits at once: workers never write files, the parent does. Tasks are handed out one at a time to the first free worker. When a worker
 * dies while processing (uncaught error, out of memory, process.exit in native code), that image
 * is reported failed and a fresh worker replaces the dead one. A worker that cannot start (the
 * processor module fails to load) stops the whole batch with that reason.
 */
import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { FractozoneError } from '../../core/errors.js';
import type { MeasureParams, MeasureResult } from '../../core/pipeline/index.js';
import { printable } from '../../core/text/printable.js';
import type { ProcessInput } from './processor.js';

export interface PoolTask {
  bytes: Uint8Array;
  input: ProcessInput;
  params: MeasureParams;
}

/** What became of one image: processed, failed (with a code), or cancelled by a stop (nothing to record). */
export type PoolOutcome =
  | { kind: 'done'; result: MeasureResult; overlayPng: Uint8Array | null; thumbnailPng: Uint8Array | null }
  | { kind: 'failed'; error: { code: string; message: string } }
  | { kind: 'cancelled' };

/** Messages a worker sends (see worker.ts). */
export type WorkerMessage =
  | { type: 'ready' }
  | { type: 'startup-failed'; message: string }
  | { type: 'done'; id: number; ok: true; result: MeasureResult; overlayPng: Uint8Array | null; thumbnailPng: Uint8Array | null; cpuS: number }
  | { type: 'done'; id: number; ok: false; error: { code: string; message: string }; cpuS: number };

interface Slot {
  worker: ChildProcess;
  /** CPU seconds the worker reported with its last image. */
  cpuS: number;
  ready: boolean;
  busy: { id: number; resolve: (o: PoolOutcome) => void } | null;
  /** Timer of the image in progress (with {@link PoolOptions.imageTimeoutS}). */
  timer: ReturnType<typeof setTimeout> | null;
  /** Set when the pool killed the worker for taking too long. */
  timedOut: boolean;
}

export interface PoolOptions {
  jobs: number;
  processorModule: string;
  /** Heap limit per worker, MB (V8 `--max-old-space-size`); undefined = Node default. */
  workerMemoryMb?: number;
  /** Longest time one image may take, s: the worker is then killed and replaced; undefined = no limit. */
  imageTimeoutS?: number;
}

export class WorkerPool {
  private readonly slots: Slot[] = [];
  private readonly queue: { id: number; task: PoolTask; resolve: (o: PoolOutcome) => void }[] = [];
  private nextId = 1;
  private fatal: Error | null = null;
  private fatalReject: ((e: Error) => void)[] = [];
  private closed = false;
  private stopping = false;
  /** Number of workers replaced after a crash. */
  replaced = 0;
  /** CPU seconds reported by workers that have been replaced. */
  private deadCpuS = 0;

  /** CPU seconds used by the workers, as last reported (with each finished image). */
  get workerCpuS(): number {
    return this.slots.reduce((a, s) => a + s.cpuS, this.deadCpuS);
  }

  constructor(private readonly opts: PoolOptions) {
    for (let i = 0; i < Math.max(1, opts.jobs); i++) this.slots.push(this.spawn());
  }

  private spawn(): Slot {
    const execArgv = ['--single-threaded', ...(this.opts.workerMemoryMb ? [`--max-old-space-size=${this.opts.workerMemoryMb}`] : [])];
    const worker = fork(fileURLToPath(new URL('./worker.js', import.meta.url)), [this.opts.processorModule], {
      execArgv,
      serialization: 'advanced',
      stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
    });
    const slot: Slot = { worker, cpuS: 0, ready: false, busy: null, timer: null, timedOut: false };
    worker.on('message', (msg: WorkerMessage) => {
      if (msg.type === 'ready') {
        slot.ready = true;
        this.pump();
      } else if (msg.type === 'startup-failed') {
        this.fail(new FractozoneError('PROCESSING_FAILED', `a batch worker could not start: ${printable(String(msg.message))}`, 'processing'));
      } else if (msg.type === 'done' && slot.busy && slot.busy.id === msg.id) {
        if (typeof msg.cpuS === 'number') slot.cpuS = msg.cpuS;
        this.clearTimer(slot);
        const b = slot.busy;
        slot.busy = null;
        b.resolve(
          msg.ok
            ? {
                kind: 'done',
                result: msg.result,
                overlayPng: msg.overlayPng ? new Uint8Array(msg.overlayPng) : null,
                thumbnailPng: msg.thumbnailPng ? new Uint8Array(msg.thumbnailPng) : null,
              }
            : { kind: 'failed', error: msg.error },
        );
        this.pump();
      }
    });
    let why = '';
    // the last error line the worker printed (an uncaught exception, V8's out-of-memory message)
    let errTail = '';
    worker.stderr?.setEncoding('utf8');
    worker.stderr?.on('data', (d: string) => {
      errTail = (errTail + d).slice(-8192);
    });
    worker.on('error', (e) => {
      why = e instanceof Error ? `${(e as NodeJS.ErrnoException).code ?? e.name}: ${e.message}` : String(e);
    });
    worker.on('exit', (code, signal) => {
      if (!why) why = lastErrorLine(errTail) || (signal ? `signal ${signal}` : `exit code ${code}`);
      if (this.closed) {
        slot.busy?.resolve({ kind: 'cancelled' });
        slot.busy = null;
        return;
      }
      const idx = this.slots.indexOf(slot);
      if (idx < 0) return;
      this.clearTimer(slot);
      if (this.stopping) {
        // stopped by abort(): the image is not recorded, and no new worker is started
        if (slot.busy) slot.busy.resolve({ kind: 'cancelled' });
        slot.busy = null;
        this.deadCpuS += slot.cpuS;
        slot.cpuS = 0;
        return;
      }
      if (!slot.ready && !slot.busy) {
        this.fail(new FractozoneError('PROCESSING_FAILED', `a batch worker stopped during start-up (${why || `exit code ${code}`})`, 'processing'));
        return;
      }
      if (slot.busy) {
        const b = slot.busy;
        slot.busy = null;
        b.resolve({
          kind: 'failed',
          error: slot.timedOut
            ? { code: 'IMAGE_TIMEOUT', message: `the image took longer than --image-timeout ${this.opts.imageTimeoutS} s; its worker was stopped` }
            : { code: 'PROCESSING_FAILED', message: `the worker stopped while processing this image (${why || `exit code ${code}`})` },
        });
      }
      this.replaced++;
      this.deadCpuS += slot.cpuS;
      this.slots[idx] = this.spawn();
    });
    return slot;
  }

  private clearTimer(slot: Slot): void {
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = null;
  }

  private fail(e: Error): void {
    if (this.fatal) return;
    this.fatal = e;
    for (const r of this.fatalReject) r(e);
    this.fatalReject = [];
  }

  private pump(): void {
    for (const slot of this.slots) {
      if (!slot.ready || slot.busy || this.queue.length === 0) continue;
      const job = this.queue.shift()!;
      slot.busy = { id: job.id, resolve: job.resolve };
      const b = job.task.bytes;
      slot.worker.send({ type: 'task', id: job.id, bytes: b, input: job.task.input, params: job.task.params });
      const limit = this.opts.imageTimeoutS;
      if (limit) {
        slot.timer = setTimeout(() => {
          slot.timer = null;
          slot.timedOut = true;
          slot.worker.kill('SIGKILL');
        }, limit * 1000);
      }
    }
  }

  /** Queues one image; resolves with its outcome, rejects only when the pool cannot run at all. */
  run(task: PoolTask): Promise<PoolOutcome> {
    if (this.fatal) return Promise.reject(this.fatal);
    if (this.stopping) return Promise.resolve({ kind: 'cancelled' });
    return new Promise<PoolOutcome>((resolve, reject) => {
      this.fatalReject.push(reject);
      this.queue.push({ id: this.nextId++, task, resolve });
      this.pump();
    });
  }

  /** Number of tasks waiting or running. */
  get pending(): number {
    return this.queue.length + this.slots.filter((s) => s.busy).length;
  }

  /**
   * Stop handing out images: queued ones resolve as cancelled; images in progress go on (see
   * {@link abort}).
   */
  stop(): void {
    this.stopping = true;
    for (const job of this.queue.splice(0)) job.resolve({ kind: 'cancelled' });
  }

  /** Stop at once: as {@link stop}, and the workers busy with an image are killed (those images cancelled). */
  abort(): void {
    this.stop();
    for (const s of this.slots) if (s.busy) s.worker.kill('SIGKILL');
  }

  /** Number of images in progress. */
  get running(): number {
    return this.slots.filter((s) => s.busy).length;
  }

  /**
   * Ends every worker: the IPC channel is closed (a worker exits when its parent disconnects);
   * one that has not gone after a second is killed. Workers ignore SIGINT/SIGTERM so that a
   * Ctrl-C on the terminal (sent to the whole process group) reaches the batch alone.
   */
  async close(): Promise<void> {
    this.closed = true;
    for (const s of this.slots) this.clearTimer(s);
    await Promise.all(
      this.slots.map(
        (s) =>
          new Promise<void>((resolve) => {
            if (s.worker.exitCode !== null || s.worker.signalCode !== null) return resolve();
            const timer = setTimeout(() => s.worker.kill('SIGKILL'), 1000);
            s.worker.once('exit', () => {
              clearTimeout(timer);
              resolve();
            });
            if (s.busy) s.worker.kill('SIGKILL');
            else if (s.worker.connected) s.worker.disconnect();
            else s.worker.kill('SIGKILL');
          }),
      ),
    );
  }

  /** Kills every worker at once (synchronous; for an immediate abort before process.exit). */
  killAll(): void {
    this.closed = true;
    for (const s of this.slots) {
      this.clearTimer(s);
      if (s.worker.exitCode === null && s.worker.signalCode === null) s.worker.kill('SIGKILL');
    }
  }
}

/**
 * The line of a worker's stderr that names its error: V8's "FATAL ERROR: …" (out of memory) if
 * present, else the last line naming an error, without stack or native frames.
 */
function lastErrorLine(text: string): string {
  const lines = text
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l !== '' && !l.startsWith('at ') && !/^\^+$/.test(l) && !l.startsWith('Node.js v') && !/^\d+: 0x[0-9a-f]+ /i.test(l));
  const fatal = lines.filter((l) => l.startsWith('FATAL ERROR:'));
  const err = fatal.length ? fatal : lines.filter((l) => /error|heap|memory/i.test(l));
  return printable((err.length ? err[err.length - 1] : (lines[lines.length - 1] ?? '')).slice(0, 300));
}
