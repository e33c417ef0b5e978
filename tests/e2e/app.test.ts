/**
 * The web app end to end in headless Chromium: open a rendered fractograph through the file input,
 * find the scale bar, find the boundary, check the mean width against the renderer's exact truth,
 * drag a boundary point and see the statistics change (and undo), export the result JSON and
 * compare it with the CLI's result for the same image and parameters. No console errors, no
 * request outside the app's origin. Screenshots go to /tmp/fractozone-e2e-*.png.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, launchApp, repoRoot, type AppSession } from './harness.js';

const cli = join(repoRoot, 'dist/cli/main.js');

function runCli(args: string[]): string {
  return execFileSync(process.execPath, [cli, ...args], { cwd: repoRoot, encoding: 'utf8', maxBuffer: 64 << 20 });
}

/** Result without the wall-clock diagnostics (not part of the reproducible content). */
function reproducible(r: Record<string, unknown>): Record<string, unknown> {
  const { diagnostics: _d, ...rest } = r;
  return rest;
}

describe.skipIf(SKIP_E2E)('web app in Chromium', () => {
  let s: AppSession;
  let dir: string;
  let image: string;
  let truth: { band: { meanWidthUm: number }; scaleBar: { lengthUm: number } };

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'fractozone-app-'));
    image = join(dir, 'invented-e2e.png');
    // invented test image with exact truth, written by the project's own renderer (CLI)
    runCli(['render', '--out', image, '--seed', '3', '--size', '1200x900', '--pixel-size', '6.5um']);
    truth = JSON.parse(readFileSync(join(dir, 'invented-e2e.truth.json'), 'utf8'));
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('opens, measures within 4 % of the truth, re-measures an edit, exports the CLI result', async () => {
    const { page } = s;
    await expect.poll(() => page.getByTestId('engine-status').textContent(), { timeout: 60_000 }).toContain('self-test passed');

    await page.getByTestId('file-input').setInputFiles(image);
    await page.getByTestId('doc-list').getByText('invented-e2e.png').waitFor({ timeout: 30_000 });
    await expect.poll(() => page.getByTestId('readout').textContent()).toContain('invented-e2e.png: 1200×900 px');

    const barUm = truth.scaleBar.lengthUm;
    await page.getByTestId('bar-um').fill(String(barUm));
    await page.getByTestId('find-bar').click();
    await expect.poll(() => page.getByTestId('scale-source').textContent(), { timeout: 30_000 }).toMatch(/scale bar of 1000 µm — [\d.]+ µm\/px/);

    await page.getByTestId('analyse').click();
    await page.getByTestId('stats-table').waitFor({ timeout: 120_000 });
    await page.screenshot({ path: '/tmp/fractozone-e2e-analysed.png' });
    // the mean shown once the latest re-measure has come back (no update pending)
    const meanOf = async () => {
      await page.locator('[data-testid=stats-table][data-stale=false]').waitFor({ timeout: 30_000 });
      return Number(await page.getByTestId('stat-mean').getAttribute('data-value'));
    };
    const mean = await meanOf();
    // truth: the renderer's exact mean band width (same geometry tables as the pixels)
    expect(Math.abs(mean - truth.band.meanWidthUm) / truth.band.meanWidthUm).toBeLessThan(0.04);
    expect(await page.getByTestId('stat-mean').textContent()).toMatch(/µm$/);

    // exported result JSON = the CLI's result for the same image and parameters
    const dl = page.waitForEvent('download');
    await page.getByTestId('export-json').click();
    const file = await (await dl).path();
    const exported = JSON.parse(readFileSync(file, 'utf8')) as Record<string, unknown>;
    const fromCli = JSON.parse(runCli(['measure', image, '--bar-length', `${barUm}um`, '--json'])) as Record<string, unknown>;
    // dist/ (CLI) and dist-app/ must come from the same sources: `npm test` builds both first
    expect(reproducible(exported), 'app and CLI results differ (stale build? run npm run build && npm run build:app)').toEqual(reproducible(fromCli));

    // drag one boundary point 40 screen px towards the centre → statistics change; undo restores them
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    const box = (await page.getByTestId('stage-wrap').boundingBox())!;
    const band = exported.band as { boundary: { polygon: { x: number; y: number }[] } };
    const centre = (exported.specimen as { center: { x: number; y: number } }).center;
    const v = band.boundary.polygon[0];
    const sx = box.x + view.x + v.x * view.scale;
    const sy = box.y + view.y + v.y * view.scale;
    const len = Math.hypot(v.x - centre.x, v.y - centre.y);
    const ux = (v.x - centre.x) / len;
    const uy = (v.y - centre.y) / len;
    await page.mouse.move(sx, sy);
    await page.mouse.down();
    for (let k = 1; k <= 8; k++) await page.mouse.move(sx - ux * 5 * k, sy - uy * 5 * k);
    await page.mouse.up();
    await expect.poll(meanOf, { timeout: 30_000 }).not.toBe(mean);
    const edited = await meanOf();
    // moving a boundary point towards the centre widens the rim on the rays next to it: the mean rises
    expect(edited).toBeGreaterThan(mean);
    await page.screenshot({ path: '/tmp/fractozone-e2e-edited.png' });

    await page.locator('body').click({ position: { x: 5, y: 5 } });
    await page.keyboard.press('Control+z');
    await expect.poll(meanOf, { timeout: 30_000 }).toBeCloseTo(mean, 6);

    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });
});
