/**
 * More of the web app in headless Chromium: a 16-bit TIFF opens with its metadata scale, the
 * cursor readout in px and µm, the critical distance from the material form against the formula,
 * the session file round trip, and the CSV / HTML exports.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, launchApp, repoRoot, type AppSession } from './harness.js';

const cli = join(repoRoot, 'dist/cli/main.js');

describe.skipIf(SKIP_E2E)('web app extras in Chromium', () => {
  let s: AppSession;
  let dir: string;
  let tif: string;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'fractozone-app2-'));
    tif = join(dir, 'invented-16bit.tif');
    execFileSync(process.execPath, [cli, 'render', '--out', tif, '--seed', '5', '--size', '1000x800', '--pixel-size', '7.5um', '--bit-depth', '16'], { cwd: repoRoot });
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('16-bit TIFF, readout, material → L, session round trip, exports', async () => {
    const { page } = s;
    await expect.poll(() => page.getByTestId('engine-status').textContent(), { timeout: 60_000 }).toContain('self-test passed');
    await page.getByTestId('file-input').setInputFiles(tif);
    await page.getByTestId('doc-list').getByText('invented-16bit.tif').waitFor({ timeout: 30_000 });
    await expect.poll(() => page.getByTestId('readout').textContent()).toContain('16-bit');
    // the renderer writes the pixel size into the TIFF resolution tags
    await expect.poll(() => page.getByTestId('scale-source').textContent()).toBe('from file metadata — 7.5 µm/px');

    // cursor readout: image centre in px and µm
    const box = (await page.getByTestId('stage-wrap').boundingBox())!;
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    await page.mouse.move(box.x + view.x + 400 * view.scale, box.y + view.y + 300 * view.scale);
    await expect.poll(() => page.getByTestId('readout').textContent()).toMatch(/x 400\.0 px, y 300\.0 px\s+—\s+x 3000 µm, y 2250 µm/);

    // wheel zooms about the cursor: the image point under it stays put
    await page.mouse.wheel(0, -300);
    await expect.poll(async () => JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}').scale).toBeGreaterThan(view.scale);
    await expect.poll(() => page.getByTestId('readout').textContent()).toMatch(/x 400\.0 px, y 300\.0 px/);
    await page.getByTestId('zoom-fit').click();

    // typed pixel size becomes the active source
    await page.getByTestId('typed-um').fill('7.5');
    await page.getByText('Set', { exact: true }).click();
    await expect.poll(() => page.getByTestId('scale-source').textContent()).toBe('typed pixel size — 7.5 µm/px');

    await page.getByTestId('analyse').click();
    await page.getByTestId('stats-table').waitFor({ timeout: 120_000 });
    // the mean shown once the latest re-measure has come back (no update pending)
    const meanOf = async () => {
      await page.locator('[data-testid=stats-table][data-stale=false]').waitFor({ timeout: 30_000 });
      return Number(await page.getByTestId('stat-mean').getAttribute('data-value'));
    };
    const mean = await meanOf();
    expect(mean).toBeGreaterThan(0);

    // material form: K_c = 30 MPa·√m, σ0 = 1000 MPa → L = (1/π)(K_c/σ0)² = 286.48 µm
    // (Taylor, The Theory of Critical Distances, Elsevier 2007: L = (1/π)(K_c/σ_0)²)
    await page.getByTestId('kc').fill('30');
    await page.getByTestId('sigma0').fill('1000');
    await page.getByTestId('tcd-table').waitFor({ timeout: 30_000 });
    const expectedL = (1 / Math.PI) * (30 / 1000) ** 2 * 1e6;
    await expect.poll(() => page.getByTestId('tcd-table').textContent(), { timeout: 30_000 }).toContain(`${expectedL.toFixed(1)} µm`);
    await expect.poll(() => page.getByTestId('verdict').textContent()).toMatch(/\S/);

    // session round trip: exclude a sector, save, undo, reopen → the sector and its numbers come back
    const before = await meanOf();
    await page.getByTestId('tool-sector').click();
    const centre = { x: box.x + view.x + 500 * view.scale, y: box.y + view.y + 400 * view.scale };
    await page.mouse.move(centre.x + 150, centre.y - 20);
    await page.mouse.down();
    await page.mouse.move(centre.x + 120, centre.y - 100);
    await page.mouse.move(centre.x + 20, centre.y - 150);
    await page.mouse.up();
    await expect.poll(meanOf, { timeout: 30_000 }).not.toBe(before);
    const withSector = await meanOf();
    const dl = page.waitForEvent('download');
    await page.getByTestId('export-session').click();
    const sessionPath = await (await dl).path();
    const session = JSON.parse(readFileSync(sessionPath, 'utf8')) as { schema: string; exclude: unknown[]; image: { sha256: string } };
    expect(session.schema).toBe('fractozone.session/1');
    expect(session.exclude).toHaveLength(1);
    await page.getByTestId('undo').click();
    await expect.poll(meanOf, { timeout: 30_000 }).toBeCloseTo(before, 6);
    await page.getByTestId('open-session').setInputFiles(sessionPath);
    await expect.poll(meanOf, { timeout: 30_000 }).toBeCloseTo(withSector, 6);

    // outline tool: dragging the centre handle moves the outline → re-measured without re-segmenting
    const beforeOutline = await meanOf();
    await page.keyboard.press('o');
    const v2 = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    const dlRes = page.waitForEvent('download');
    await page.getByTestId('export-json').click();
    const res = JSON.parse(readFileSync(await (await dlRes).path(), 'utf8')) as { specimen: { outline: { x: number; y: number }[] } };
    const cx = res.specimen.outline.reduce((a, p) => a + p.x, 0) / res.specimen.outline.length;
    const cy = res.specimen.outline.reduce((a, p) => a + p.y, 0) / res.specimen.outline.length;
    const hx = box.x + v2.x + cx * v2.scale;
    const hy = box.y + v2.y + cy * v2.scale;
    await page.mouse.move(hx, hy);
    await page.mouse.down();
    for (let k = 1; k <= 5; k++) await page.mouse.move(hx + 3 * k, hy);
    await page.mouse.up();
    await expect.poll(meanOf, { timeout: 30_000 }).not.toBe(beforeOutline);

    // CSV row and HTML report
    const dlCsv = page.waitForEvent('download');
    await page.getByText('CSV row').click();
    const csv = readFileSync(await (await dlCsv).path(), 'utf8').split(/\r?\n/);
    expect(csv[0].split(',')).toContain('width_mean_um');
    expect(csv[1]).toContain('invented-16bit.tif');
    const dlHtml = page.waitForEvent('download');
    await page.getByText('HTML report').click();
    const html = readFileSync(await (await dlHtml).path(), 'utf8');
    expect(html).toContain('<svg');
    expect(html).toContain('data:image/png;base64,');
    expect(html).toContain('qualified engineer');
    await page.screenshot({ path: '/tmp/fractozone-e2e-extras.png' });

    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });
});
