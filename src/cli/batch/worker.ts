/**
 * Batch worker process (forked by pool.ts with the processor module URL as its argument): loads
 * OpenCV once, loads the processor, then processes one image per message. Messages in:
 * {type:'task', id, bytes, input, params}. Out: {@link WorkerMessage}: {type:'ready'} once, then
 * {type:'done', id, ok, …} per task.
 *
 * SIGINT and SIGTERM are ignored: a Ctrl-C on the terminal goes to the whole process group, and
 * the batch (the parent) decides what happens to the images in progress. A worker exits when the
 * parent closes the IPC channel or disappears, or when it is killed.
 */
import { loadCvNode } from '../cvNode.js';
import { installNodeZlib } from '../nodeZlib.js';
import { isFractozoneError } from '../../core/errors.js';
import type { MeasureParams } from '../../core/pipeline/index.js';
import { printable } from '../../core/text/printable.js';
import type { WorkerMessage } from './pool.js';
import { loadProcessor, type ProcessInput } from './processor.js';
import { thumbnailPng } from './thumb.js';

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

function errorOf(e: unknown): { code: string; message: string } {
  if (isFractozoneError(e)) return { code: e.code, message: printable(e.message) };
  const raw = e instanceof Error ? e.message : String(e);
  return { code: 'PROCESSING_FAILED', message: printable(`processing failed: ${raw.split('\n')[0]}`) };
}

async function main(): Promise<void> {
  const sendRaw = process.send?.bind(process);
  if (!sendRaw) throw new Error('batch worker started without an IPC channel');
  const send = (m: WorkerMessage): void => {
    sendRaw(m);
  };
  // the batch was stopped or killed: nothing left to report to
  process.on('disconnect', () => process.exit(0));
  process.on('SIGINT', () => {});
  process.on('SIGTERM', () => {});
  const moduleUrl = process.argv[2];
  if (!moduleUrl) throw new Error('batch worker started without a processor module');
  loadCvNode();
  installNodeZlib();
  const proc = await loadProcessor(moduleUrl);
  process.on('message', (msg: TaskMsg) => {
    if (msg.type !== 'task') return;
    proc(msg.bytes, msg.input, msg.params).then(
      (o) => {
        const overlayPng = o.overlayPng;
        const thumb = o.thumbnailPng ?? (overlayPng ? thumbnailPng(overlayPng) : null);
        send({ type: 'done', id: msg.id, ok: true, result: o.result, overlayPng, thumbnailPng: thumb, cpuS: cpuS() });
      },
      (e: unknown) => send({ type: 'done', id: msg.id, ok: false, error: errorOf(e), cpuS: cpuS() }),
    );
  });
  send({ type: 'ready' });
}

main().catch((e: unknown) => {
  // A start-up failure: tell the pool why, then end.
  const message = printable((e instanceof Error ? e.message : String(e)).split('\n')[0]);
  if (process.send) process.send({ type: 'startup-failed', message } satisfies WorkerMessage, () => process.exit(1));
  else process.exit(1);
});
