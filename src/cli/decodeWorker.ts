/**
 * The decoding thread of cli/decodeThread.ts: decodes one image (PNG data through Node's zlib, as
 * on the main thread) and sends the raster back without copying it.
 */
import { parentPort } from 'node:worker_threads';
import { decodeImage } from '../core/decode/index.js';
import { installNodeZlib } from './nodeZlib.js';
import type { DecodeReply, DecodeRequest } from './decodeThread.js';

installNodeZlib();
parentPort?.once('message', (m: DecodeRequest) => {
  let reply: DecodeReply;
  try {
    const decoded = decodeImage(m.bytes, m.maxPixels !== undefined ? { maxPixels: m.maxPixels } : undefined);
    reply = { decoded };
    parentPort?.postMessage(reply, [decoded.raster.data.buffer as ArrayBuffer]);
  } catch {
    // the main thread decodes again and reports the error as it always does
    reply = { decoded: null };
    parentPort?.postMessage(reply);
  }
});
