/** The engine worker loads OpenCV in headless Chromium and passes its self-test through core. */
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

  it('loads OpenCV in the worker; core’s ellipse fit (cv.fitEllipse) gives back a circle of radius 10 px', async () => {
    const status = s.page.getByTestId('engine-status');
    await expect.poll(async () => status.textContent(), { timeout: 60_000 }).toMatch(/self-test (passed|FAILED)|failed to start/);
    // The worker fits an ellipse to 24 points on a circle of radius 10 px about (50, 40) and checks
    // both semi-axes and the centre to 1e-3 px (a circle is its own best-fitting ellipse).
    expect(await status.textContent()).toContain('self-test passed');
    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
    expect(s.requests.some((u) => u.endsWith('.wasm'))).toBe(true);
  });
});
