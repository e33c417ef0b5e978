/**
 * Keeps every document's result following its inputs: whenever a document's inputs differ from
 * those of its result, the engine recomputes from the stored geometry (milliseconds). One request
 * per document at a time; when it comes back, the latest inputs are sent next.
 */
import { useEffect, useRef } from 'react';
import type { Engine } from '../worker/client.js';
import { EngineError } from '../worker/client.js';
import { derive, type AppState } from '../state/store.js';
import { wantsRecompute } from '../state/results.js';
import { inAppWords } from '../state/words.js';
import type { Update } from './useStore.js';

export function useRecompute(engine: Engine | null, ready: boolean, state: AppState, update: Update): void {
  const inFlight = useRef(new Map<string, string>());
  useEffect(() => {
    if (!engine || !ready) return;
    for (const d of state.docs) {
      const req = wantsRecompute(d, state.series);
      if (!req || !d.base || inFlight.current.has(d.id)) continue;
      inFlight.current.set(d.id, req.key);
      const id = d.id;
      engine
        .request({ type: 'recompute', base: d.base.result, params: req.params, outline: req.outline })
        .then(
          (r) => {
            // cleared before the update, whose re-render sends the latest inputs if they moved on
            inFlight.current.delete(id);
            const patch = r.kind === 'result' ? { result: r.result, resultKey: req.key, materialError: r.materialError, refused: null } : { refused: { key: req.key, message: `${r.reason}: press “Find boundary” to measure again` } };
            update((s) => derive(s, id, patch));
          },
          (e: Error) => {
            inFlight.current.delete(id);
            const code = e instanceof EngineError ? e.code : 'PROCESSING_FAILED';
            update((s) => derive(s, id, { refused: { key: req.key, message: inAppWords(code, e.message) } }));
          },
        );
    }
  }, [engine, ready, state.docs, state.series, update]);
}
