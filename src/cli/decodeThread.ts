/**
 * `measure --threads 2` decodes the image on a second thread while the main thread loads opencv-wasm
 * (≈ 0.2 s of CPU, embind building its wrappers, which only the main thread can use): the two no
 * longer wait for each other. The same decoder on the same bytes, so the same raster; when the
 * thread fails for any reason (a bad file included) the main thread decodes as before and reports
 * the error itself. Off by default: under the shared machine's load (7–11 on 2 cores) it measured
 * slower and +0.15 s CPU (DEVELOPERS.md "Performance notes"). Never in batch (its forked workers
 * keep both cores busy and run single-threaded).
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { DecodedImage } from '../core/index.js';

/** Message to the decoding thread. */
export interface DecodeRequest {
  bytes: Uint8Array;
  maxPixels?: number;
}

/** Its answer: the decoded image, or null when it could not decode it. */
export interface DecodeReply {
  decoded: DecodedImage | null;
}

/**
 * Starts decoding `bytes` on another thread; resolves to the decoded image, or to null when the
 * thread could not (the caller then decodes on its own thread). Null at once on a one-core machine.
 */
export function decodeOnThread(bytes: Uint8Array, maxPixels: number | undefined): Promise<DecodedImage | null> | null {
  if (availableParallelism() < 2) return null;
  let worker: Worker;
  try {
    worker = new Worker(new URL('./decodeWorker.js', import.meta.url));
  } catch {
    return null;
  }
  return new Promise<DecodedImage | null>((resolve) => {
    const done = (d: DecodedImage | null): void => {
      resolve(d);
      void worker.terminate();
    };
    worker.once('message', (m: DecodeReply) => done(m.decoded));
    worker.once('error', () => done(null));
    worker.once('exit', () => done(null));
    worker.postMessage({ bytes, ...(maxPixels !== undefined ? { maxPixels } : {}) } satisfies DecodeRequest);
  });
}
