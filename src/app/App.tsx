/** Top-level component (placeholder while the panels are built). */
import { useEffect, useState } from 'react';
import { createEngine } from './worker/client.js';

export function App() {
  const [status, setStatus] = useState('starting the engine…');
  useEffect(() => {
    const engine = createEngine();
    engine
      .request({ type: 'cvSelfTest' }, (stage, f) => setStatus(`${stage} ${Math.round(f * 100)} %`))
      .then((r) => setStatus(r.output.every((v) => Math.abs(v - 1) < 1e-6) ? 'engine ready (OpenCV self-test passed)' : 'engine self-test FAILED'))
      .catch((e: Error) => setStatus(`engine failed: ${e.message}`));
    return () => engine.terminate();
  }, []);
  return <div data-testid="engine-status">{status}</div>;
}
