/**
 * UI-thread handle on the engine worker: typed request/response with progress callbacks.
 * The worker is a module worker bundled by Vite (`new URL(..., import.meta.url)` pattern).
 */
import type { EngineReplies, EngineRequest, ResponseMessage } from './protocol.js';

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
  request<T extends EngineRequest>(req: T, onProgress?: Progress, transfer?: Transferable[]): Promise<EngineReplies[T['type']]>;
  terminate(): void;
}

/** Starts the engine worker; `globalProgress` receives every progress message. */
export function createEngine(globalProgress?: Progress): Engine {
  const worker = new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module', name: 'fractozone-engine' });
  let next = 1;
  const pending = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void; onProgress?: Progress }>();
  worker.onmessage = (ev: MessageEvent<ResponseMessage>) => {
    const m = ev.data;
    const p = pending.get(m.id);
    if (m.type === 'progress') {
      p?.onProgress?.(m.stage, m.fraction);
      globalProgress?.(m.stage, m.fraction);
      return;
    }
    if (!p) return;
    pending.delete(m.id);
    if (m.ok) p.resolve(m.value);
    else p.reject(new EngineError(m.error.code, m.error.message));
  };
  worker.onerror = (ev) => {
    ev.preventDefault();
    for (const p of pending.values()) p.reject(new EngineError('PROCESSING_FAILED', `engine worker failed: ${ev.message}`));
    pending.clear();
  };
  return {
    request(req, onProgress, transfer = []) {
      const id = next++;
      return new Promise((resolve, reject) => {
        pending.set(id, { resolve: resolve as (v: unknown) => void, reject, onProgress });
        worker.postMessage({ id, ...req }, transfer);
      });
    },
    terminate() {
      worker.terminate();
    },
  };
}
