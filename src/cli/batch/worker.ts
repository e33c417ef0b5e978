/**
 * Batch worker process (forked by pool.ts with the processor module URL as its argument): loads
 * OpenCV once, loads the processor, then processes one image per message. Messages in: {type:'task', id, bytes, input, params}. Out: {type:'ready'} once, then
 * {type:'done', id, ok, result?, overlayPng?, error?} per task.
 */
import { loadCvNode } from '../cv-node.js';
import { isFractozoneError } from '../../core/errors.js';
import { printable } from '../../core/text/printable.js';
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

/** CPU seconds this worker process has used so far (reported with every image). */
function cpuS(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

async function main(): Promise<void> {
  const send = process.send?.bind(process);
  if (!send) throw new Error('batch worker started without an IPC channel');
  // the batch was stopped or killed: nothing left to report to
  process.on('disconnect', () => process.exit(0));
  const moduleUrl = process.argv[2];
  if (!moduleUrl) throw new Error('batch worker started without a processor module');
  loadCvNode();
  const proc = await loadProcessor(moduleUrl);
  process.on('message', (msg: TaskMsg) => {
    if (msg.type !== 'task') return;
    proc(msg.bytes, msg.input, msg.params).then(
      (o) => {
        const overlayPng = o.overlayPng;
        const thumb = o.thumbnailPng ?? (overlayPng ? thumbnailPng(overlayPng) : null);
        send({ type: 'done', id: msg.id, ok: true, result: o.result, overlayPng, thumbnailPng: thumb, cpuS: cpuS() });
      },
      (e: unknown) => {
        const error = isFractozoneError(e)
          ? { code: e.code, message: printable(e.message) }
          : { code: 'PROCESSING_FAILED', message: printable(`processing failed: ${(e instanceof Error ? e.message : String(e)).split('\n')[0]}`) };
        send({ type: 'done', id: msg.id, ok: false, error, cpuS: cpuS() });
      },
    );
  });
  send({ type: 'ready' });
}

main().catch((e: unknown) => {
  // A start-up failure: tell the pool why, then end.
  const message = e instanceof Error ? e.message : String(e);
  if (process.send) process.send({ type: 'startup-failed', message }, () => process.exit(1));
  else process.exit(1);
});
