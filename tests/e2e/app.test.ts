/**
 * The web app end to end in headless Chromium, on a rendered fractograph with exact truth: open it
 * through the file input, set the scale from its bar, find the boundary (mean within 4 % of the
 * truth), export the result JSON (= the command line's for the same image and scale), change the
 * pixel size 5 → 10 µm/px (the mean doubles at once, from the stored geometry; the exported JSON
 * equals the command line's at 10 µm/px), drag a boundary point (the mean changes) and undo it.
 * No console errors, no request outside the app's origin.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, currentMean, downloadOf, launchApp, openImage, repoRoot, setPixelSize, waitForStart, type AppSession } from './harness.js';
import { expectSameResult } from '../helpers/sameResult.js';

const cli = join(repoRoot, 'dist/cli/main.js');

function runCli(args: string[]): string {
  return execFileSync(process.execPath, [cli, ...args], { cwd: repoRoot, encoding: 'utf8', maxBuffer: 64 << 20 });
}

const STALE_BUILD = 'app and CLI results differ (stale build? run npm run build && npm run build:app)';

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

  it('measures within 4 % of the truth and exports the command line’s result', async () => {
    const { page } = s;
    await waitForStart(page);
    await openImage(page, image);
    await expect.poll(() => page.getByTestId('readout').textContent()).toContain('invented-e2e.png: 1200×900 px');
    expect(await page.getByTestId('result-state').getAttribute('data-state')).toBe('none');

    const barUm = truth.scaleBar.lengthUm;
    await page.getByTestId('bar-um').fill(String(barUm));
    await page.getByTestId('find-bar').click();
    await expect.poll(() => page.getByTestId('scale-source').textContent(), { timeout: 30_000 }).toMatch(/µm\/px — scale bar 1000 µm = [\d.]+ px/);

    await page.getByTestId('find-boundary').click();
    const mean = await currentMean(page);
    // truth: the renderer's exact mean band width (same geometry tables as the pixels)
    expect(Math.abs(mean - truth.band.meanWidthUm) / truth.band.meanWidthUm).toBeLessThan(0.04);
    expect(await page.getByTestId('stat-mean').textContent()).toMatch(/µm$/);

    const exported = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as Record<string, unknown>;
    const fromCli = JSON.parse(runCli(['measure', image, '--bar-length', `${barUm}um`, '--json'])) as Record<string, unknown>;
    expectSameResult(exported, fromCli, STALE_BUILD);
  });

  it('pixel size 5 → 10 µm/px: the mean doubles at once and the JSON equals the command line’s at 10 µm/px', async () => {
    const { page } = s;
    await setPixelSize(page, 5);
    await page.getByTestId('find-boundary').click();
    const at5 = await currentMean(page);
    await setPixelSize(page, 10);
    const at10 = await currentMean(page);
    // widths come from the same polygons in px: twice the pixel size, twice the width (3-decimal rounding)
    expect(Math.abs(at10 - 2 * at5)).toBeLessThan(0.003);
    expect(await page.getByTestId('find-boundary').textContent()).toBe('Find boundary again');

    const exported = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as Record<string, unknown>;
    const fromCli = JSON.parse(runCli(['measure', image, '--pixel-size', '10um', '--json'])) as Record<string, unknown>;
    expectSameResult(exported, fromCli, STALE_BUILD);
    await page.screenshot({ path: '/tmp/fractozone-e2e-analysed.png' });
  });

  it('a dragged boundary point changes the mean; Ctrl+Z brings it back to the automatic boundary', async () => {
    const { page } = s;
    const mean = await currentMean(page);
    const r = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as { band: { boundary: { polygon: { x: number; y: number }[] } }; specimen: { center: { x: number; y: number } } };
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    const box = await page.getByTestId('stage-wrap').boundingBox();
    if (!box) throw new Error('no image view');
    const v = r.band.boundary.polygon[0];
    const c = r.specimen.center;
    const len = Math.hypot(v.x - c.x, v.y - c.y);
    const sx = box.x + view.x + v.x * view.scale;
    const sy = box.y + view.y + v.y * view.scale;
    await page.mouse.move(sx, sy);
    await page.mouse.down();
    for (let k = 1; k <= 8; k++) await page.mouse.move(sx - ((v.x - c.x) / len) * 5 * k, sy - ((v.y - c.y) / len) * 5 * k);
    await page.mouse.up();
    // moving a boundary point towards the centre widens the rim on the rays next to it
    await expect.poll(() => currentMean(page), { timeout: 30_000 }).toBeGreaterThan(mean);
    await page.screenshot({ path: '/tmp/fractozone-e2e-edited.png' });

    await page.keyboard.press('Control+z');
    await expect.poll(() => currentMean(page), { timeout: 30_000 }).toBeCloseTo(mean, 6);
    // the result after undo is the automatic one again (not "manual")
    const back = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as { resolved: { boundarySource: string } };
    expect(back.resolved.boundarySource).toBe('auto');

    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });
});
