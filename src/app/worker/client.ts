/**
 * UI-thread handle on the engine worker: typed request/response with progress callbacks.
 * The worker is a module worker bundled by Vite (`new URL(..., import.meta.url)` pattern).
 */
import type { EngineReplies, EngineRequest, RequestType, ResponseMessage } from './protocol.js';

export type Progress = (stage: string, fraction: number) => void;

/** An error reported by the engine worker, with the engine's stable code. */
export class EngineError extends Error {
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

export interface Engine {
  request<T extends EngineRequest>(req: T, transfer?: Transferable[]): Promise<EngineReplies[T['type']]>;
  terminate(): void;
}

interface Pending {
  resolve(v: EngineReplies[RequestType]): void;
  reject(e: Error): void;
}

/** Starts the engine worker; `onProgress` receives every progress message, and fraction 1 when no request is left. */
export function createEngine(onProgress?: Progress): Engine {
  const worker = new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module', name: 'fractozone-engine' });
  let next = 1;
  const pending = new Map<number, Pending>();
  worker.onmessage = (ev: MessageEvent<ResponseMessage>) => {
    const m = ev.data;
    if (m.type === 'progress') {
      onProgress?.(m.stage, m.fraction);
      return;
    }
    const p = pending.get(m.id);
    if (!p) return;
    pending.delete(m.id);
    if (m.ok) p.resolve(m.value);
    else p.reject(new EngineError(m.error.code, m.error.message));
    // nothing left to wait for: the progress line ends
    if (pending.size === 0) onProgress?.('', 1);
  };
  worker.onerror = (ev) => {
    ev.preventDefault();
    for (const p of pending.values()) p.reject(new EngineError('PROCESSING_FAILED', `the engine stopped: ${ev.message}`));
    pending.clear();
  };
  return {
    request<T extends EngineRequest>(req: T, transfer: Transferable[] = []) {
      const id = next++;
      return new Promise<EngineReplies[T['type']]>((resolve, reject) => {
        // the worker answers request `id` with the reply type of `req.type` (see engine.worker.ts)
        pending.set(id, { resolve: resolve as (v: EngineReplies[RequestType]) => void, reject });
        worker.postMessage({ id, ...req }, transfer);
      });
    },
    terminate() {
      worker.terminate();
    },
  };
}
