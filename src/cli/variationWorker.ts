/**
 * The helper thread of cli/variationHelper.ts: loads opencv-wasm at once (beside the main thread's
 * decoding), then runs each window-variation job it is sent and writes the means into the shared
 * memory that came with it.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { runWindowVariationJob } from '../core/index.js';
import { loadCvNode } from './cvNode.js';
import { JOB_DONE, JOB_FAILED, type HelperMessage } from './variationHelper.js';

const alive = new Int32Array((workerData as { alive: SharedArrayBuffer }).alive);
let ready = false;
try {
  loadCvNode();
  ready = true;
} catch {
  // every job then fails: the pipeline computes the variations itself
}
Atomics.store(alive, 0, 1);
Atomics.notify(alive, 0);

parentPort?.on('message', (m: HelperMessage) => {
  const flag = new Int32Array(m.shared, 0, 1);
  let state = JOB_FAILED;
  try {
    if (ready) {
      const means = runWindowVariationJob(m.job);
      new Float64Array(m.shared, 8, means.length).set(means.map((x) => (x === null ? NaN : x)));
      state = JOB_DONE;
    }
  } finally {
    Atomics.store(flag, 0, state);
    Atomics.notify(flag, 0);
  }
});
