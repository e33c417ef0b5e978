/** The engine worker loads OpenCV in headless Chromium and runs a cv.boxFilter. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, launchApp, type AppSession } from './harness.js';

describe.skipIf(SKIP_E2E)('engine worker in Chromium', () => {
  let s: AppSession;
  beforeAll(async () => {
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('loads OpenCV in the worker and a 3×3 box filter spreads a 9 into nine 1s', async () => {
    const status = s.page.getByTestId('engine-status');
    await expect.poll(async () => status.textContent(), { timeout: 60_000 }).toMatch(/self-test (passed|FAILED)|engine failed/);
    // Normalised 3×3 box filter of a single 9 at the centre (zero border) gives 1 at the centre;
    // the app checks all nine outputs equal 1 (common practice, no source: definition of a mean filter).
    expect(await status.textContent()).toContain('self-test passed');
    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
    expect(s.requests.some((u) => u.endsWith('.wasm'))).toBe(true);
  });
});
