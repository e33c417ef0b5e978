/**
 * Batch worker thread: loads OpenCV once, loads the processor, then processes one image per
 * message. Messages in: {type:'task', id, bytes, input, params}. Out: {type:'ready'} once, then
 * {type:'done', id, ok, result?, overlayPng?, error?} per task.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { loadCvNode } from '../cv-node.js';
import { isFractozoneError } from '../../core/errors.js';
import { loadProcessor, type ProcessInput } from './processor.js';
import { thumbnailPng } from './thumb.js';
import type { MeasureParams } from '../../core/pipeline/types.js';

interface TaskMsg {
  type: 'task';
  id: number;
  bytes: Uint8Array;
  input: ProcessInput;
  params: MeasureParams;
}

async function main(): Promise<void> {
  const port = parentPort;
  if (!port) throw new Error('batch worker started outside a worker thread');
  loadCvNode();
  const proc = await loadProcessor((workerData as { processorModule: string }).processorModule);
  port.on('message', (msg: TaskMsg) => {
    if (msg.type !== 'task') return;
    proc(msg.bytes, msg.input, msg.params).then(
      (o) => {
        const overlayPng = o.overlayPng;
        const thumb = o.thumbnailPng ?? (overlayPng ? thumbnailPng(overlayPng) : null);
        const whole = (b: Uint8Array | null | undefined): b is Uint8Array => !!b && b.byteOffset === 0 && b.byteLength === b.buffer.byteLength;
        const transfer = [overlayPng, thumb].filter(whole).map((b) => b.buffer as ArrayBuffer);
        port.postMessage({ type: 'done', id: msg.id, ok: true, result: o.result, overlayPng, thumbnailPng: thumb }, [...new Set(transfer)]);
      },
      (e: unknown) => {
        const error = isFractozoneError(e)
          ? { code: e.code, message: e.message }
          : { code: 'PROCESSING_FAILED', message: `processing failed: ${e instanceof Error ? e.message : String(e)}` };
        port.postMessage({ type: 'done', id: msg.id, ok: false, error });
      },
    );
  });
  port.postMessage({ type: 'ready' });
}

main().catch((e: unknown) => {
  // A start-up failure: tell the pool why, then let the thread end.
  parentPort?.postMessage({ type: 'startup-failed', message: e instanceof Error ? e.message : String(e) });
});
