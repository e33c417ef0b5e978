/**
 * A helper thread for `measure` (one image): the parameter range's window variations
 * (core/pipeline/helperJob.ts) run on it beside the pipeline's own texture stages, which the
 * pipeline would otherwise compute after them on the one thread. Same numbers either way (the same
 * function on the same data); wall time only. Not for batch: its forked workers already keep both
 * cores busy, so they run single-threaded (no helper).
 *
 * The pipeline is synchronous, so the answer comes back through shared memory: the worker writes
 * the means and a flag, the main thread waits on the flag with `Atomics.wait` (allowed on Node's
 * main thread). The worker loads opencv-wasm as soon as it starts, while the main thread decodes
 * the image and finds the specimen.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { VariationHelper, WindowVariationJob } from '../core/index.js';

/** A started helper; close it when the pipeline is done. */
export interface HelperThread extends VariationHelper {
  close(): void;
}

/** How long the main thread waits for a worker that has not started at all, then for a job (ms). */
const START_WAIT_MS = 10_000;
const JOB_WAIT_MS = 120_000;

/** Flag values in shared memory: 0 pending, 1 done, 2 failed (the pipeline then computes the job itself). */
export const JOB_DONE = 1;
export const JOB_FAILED = 2;

/** Message to the worker. */
export interface HelperMessage {
  job: WindowVariationJob;
  /** Int32 flag at 0, then one Float64 per factor from byte 8 (NaN: no band). */
  shared: SharedArrayBuffer;
}

/** Starts the helper thread, or returns null on a one-core machine or when it cannot start. */
export function startVariationHelper(): HelperThread | null {
  if (availableParallelism() < 2) return null;
  const alive = new Int32Array(new SharedArrayBuffer(4));
  let worker: Worker;
  try {
    worker = new Worker(new URL('./variationWorker.js', import.meta.url), { workerData: { alive: alive.buffer } });
  } catch {
    return null;
  }
  worker.unref(); // never keeps the process alive
  worker.on('error', () => undefined); // a failed job is reported through the flag; the pipeline computes it
  return {
    start(job) {
      const shared = new SharedArrayBuffer(8 + 8 * job.factors.length);
      try {
        worker.postMessage({ job, shared } satisfies HelperMessage);
      } catch {
        return () => null;
      }
      return () => {
        if (Atomics.wait(alive, 0, 0, START_WAIT_MS) === 'timed-out') return null;
        const flag = new Int32Array(shared, 0, 1);
        Atomics.wait(flag, 0, 0, JOB_WAIT_MS);
        if (Atomics.load(flag, 0) !== JOB_DONE) return null;
        return Array.from(new Float64Array(shared, 8, job.factors.length), (x) => (Number.isNaN(x) ? null : x));
      };
    },
    close() {
      void worker.terminate();
    },
  };
}
