/** Starts the engine worker once, loads OpenCV in it and reports its status and progress. */
import { useCallback, useEffect, useState } from 'react';
import { createEngine, type Engine } from '../worker/client.js';

export interface EngineStatus {
  engine: Engine | null;
  ready: boolean;
  status: string;
  progress: { stage: string; fraction: number } | null;
  /** Clears the progress line (a request has finished). */
  done(): void;
}

export function useEngine(): EngineStatus {
  const [engine, setEngine] = useState<Engine | null>(null);
  const [ready, setReady] = useState(false);
  const [status, setStatus] = useState('starting the engine…');
  const [progress, setProgress] = useState<{ stage: string; fraction: number } | null>(null);
  useEffect(() => {
    const e = createEngine((stage, fraction) => setProgress(fraction >= 1 ? null : { stage, fraction }));
    let alive = true;
    setEngine(e);
    e.request({ type: 'init' })
      .then((r) => {
        if (!alive) return;
        setStatus(r.selfTestPassed ? 'engine ready (OpenCV self-test passed)' : 'engine self-test FAILED: results cannot be trusted');
        setReady(r.selfTestPassed);
        setProgress(null);
      })
      .catch((err: Error) => alive && setStatus(`the engine failed to start: ${err.message}`));
    return () => {
      alive = false;
      e.terminate();
    };
  }, []);
  const done = useCallback(() => setProgress(null), []);
  return { engine, ready, status, progress, done };
}
