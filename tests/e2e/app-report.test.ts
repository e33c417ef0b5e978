/**
 * Saving in headless Chromium: the HTML report of the bundled sample (quality, verdict, every
 * warning, the caution, under 10,000 px tall, no JSON dump), overlay PNG and CSV row; the session file round trip
 * (also twice from the same file); the outline reset to its circle fit and reshaped by a handle;
 * a 16-bit TIFF with its metadata scale and the cursor readout in px and µm.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, currentMean, downloadOf, launchApp, openImage, repoRoot, waitCurrent, waitForStart, type AppSession } from './harness.js';

const cli = join(repoRoot, 'dist/cli/main.js');

interface Exported {
  warnings: { code: string; message: string }[];
  quality: { verdict: string; reasons: { code: string }[] };
  comparison?: { verdict: string };
  band: { widthUm: { mean: number } };
  specimen: { center: { x: number; y: number }; outline: { x: number; y: number }[]; circle: { radiusPx: number } };
  input: { widthPx: number; heightPx: number };
}

const escapeHtml = (t: string): string => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');

describe.skipIf(SKIP_E2E)('saving, sessions and the outline in Chromium', () => {
  let s: AppSession;
  let dir: string;
  let tif: string;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'fractozone-report-'));
    tif = join(dir, 'invented-16bit.tif');
    execFileSync(process.execPath, [cli, 'render', '--out', tif, '--seed', '5', '--size', '1000x800', '--pixel-size', '7.5um', '--bit-depth', '16'], { cwd: repoRoot });
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('the report of the bundled sample shows the verdict and every warning, under 10,000 px tall', async () => {
    const { page, context } = s;
    await waitForStart(page);
    // the sample opens with its manifest inputs: 1000 µm bar, strain rate 1e-3 1/s, the FZ-7 sheet
    await expect.poll(() => page.getByTestId('scale-source').textContent(), { timeout: 30_000 }).toContain('scale bar 1000 µm');
    await page.getByTestId('find-boundary').click();
    await waitCurrent(page);
    const result = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as Exported;
    expect(result.comparison).toBeDefined();
    expect(result.warnings.length).toBeGreaterThan(0);

    const html = readFileSync(await downloadOf(page, 'export-html'), 'utf8');
    expect(html).toContain(`data-verdict="${result.comparison?.verdict}"`);
    for (const w of result.warnings) expect(html).toContain(escapeHtml(w.message));
    expect(html).toContain(`data-quality="${result.quality.verdict}"`);
    // the app shows the same quality verdict above the statistics
    expect(await page.getByTestId('quality').getAttribute('data-verdict')).toBe(result.quality.verdict);
    expect(html).toContain('invented demo data');
    expect(html).toContain('qualified engineer');
    expect(html).not.toContain('"schema": "fractozone.result/1"');
    expect(html).toContain('data:image/png;base64,');
    const view = await context.newPage();
    await view.setViewportSize({ width: 1280, height: 900 });
    await view.setContent(html);
    const height = await view.evaluate(() => document.documentElement.scrollHeight);
    expect(height).toBeLessThan(10_000);
    await view.screenshot({ path: '/tmp/fractozone-e2e-report.png', fullPage: true });
    await view.close();

    // overlay PNG of the whole image (≤ 1600 px long side) and the CSV row
    const png = readFileSync(await downloadOf(page, 'export-png'));
    expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
    // the image at full extent below a caption band of the label: 6–10 lines of 9 px at text size ts
    // (report/overlay.ts: ts = round(short side / 400), band = lines · 9 · ts + 6 · ts)
    expect(png.readUInt32BE(16)).toBe(result.input.widthPx);
    const ts = Math.max(1, Math.round(Math.min(result.input.widthPx, result.input.heightPx) / 400));
    expect(png.readUInt32BE(20) - result.input.heightPx).toBeGreaterThanOrEqual(6 * 9 * ts + 6 * ts);
    expect(png.readUInt32BE(20) - result.input.heightPx).toBeLessThanOrEqual(10 * 9 * ts + 6 * ts);
    const csv = readFileSync(await downloadOf(page, 'export-csv'), 'utf8').split(/\r?\n/);
    const head = csv[0].split(',');
    expect(Number(csv[1].split(',')[head.indexOf('width_mean_um')])).toBe(result.band.widthUm.mean);
  });

  it('a session comes back with its excluded sector, also when the same file is chosen twice', async () => {
    const { page } = s;
    const before = await currentMean(page);
    const r = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as Exported;
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    const box = await page.getByTestId('stage-wrap').boundingBox();
    if (!box) throw new Error('no image view');
    const c = { x: box.x + view.x + r.specimen.center.x * view.scale, y: box.y + view.y + r.specimen.center.y * view.scale };
    await page.getByTestId('tool-sector').click();
    await page.mouse.move(c.x + 150, c.y - 20);
    await page.mouse.down();
    await page.mouse.move(c.x + 120, c.y - 100);
    await page.mouse.move(c.x + 20, c.y - 150);
    await page.mouse.up();
    await expect.poll(() => currentMean(page)).not.toBe(before);
    const withSector = await currentMean(page);
    const session = await downloadOf(page, 'export-session');
    expect(JSON.parse(readFileSync(session, 'utf8')).params.exclude).toHaveLength(1);
    for (let k = 0; k < 2; k++) {
      await page.getByTestId('undo').click();
      await expect.poll(() => currentMean(page)).toBeCloseTo(before, 6);
      await page.getByTestId('open-session').setInputFiles(session);
      await expect.poll(() => currentMean(page), { timeout: 60_000 }).toBeCloseTo(withSector, 6);
    }
  });

  it('the outline resets to its circle fit and a handle reshapes it', async () => {
    const { page } = s;
    await page.keyboard.press('o');
    await page.getByTestId('outline-circle').click();
    await waitCurrent(page);
    const r = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as Exported;
    expect(r.warnings.some((w) => w.code === 'OUTLINE_CORRECTED')).toBe(true);
    // every outline point on one circle about the (refitted) centre
    const radii = r.specimen.outline.map((p) => Math.hypot(p.x - r.specimen.center.x, p.y - r.specimen.center.y));
    expect(Math.max(...radii) - Math.min(...radii)).toBeLessThan(0.05);
    const mean = r.band.widthUm.mean;

    // drag the handle at 0° (right) 25 screen px outwards: the outline bulges there, the band widens
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    const box = await page.getByTestId('stage-wrap').boundingBox();
    if (!box) throw new Error('no image view');
    const hx = box.x + view.x + (r.specimen.center.x + r.specimen.circle.radiusPx) * view.scale;
    const hy = box.y + view.y + r.specimen.center.y * view.scale;
    await page.mouse.move(hx, hy);
    await page.mouse.down();
    for (let k = 1; k <= 5; k++) await page.mouse.move(hx + 5 * k, hy);
    await page.mouse.up();
    await expect.poll(() => currentMean(page)).toBeGreaterThan(mean);
  });

  it('a 16-bit TIFF opens with its metadata scale; the readout gives px and µm', async () => {
    const { page } = s;
    await page.mouse.move(1, 1);
    await openImage(page, tif);
    await expect.poll(() => page.getByTestId('readout').textContent()).toContain('16-bit');
    // the renderer writes the pixel size into the TIFF resolution tags (a rational: 7.5 to 1e-7)
    expect(Number(await page.getByTestId('scale-source').getAttribute('data-um-per-px'))).toBeCloseTo(7.5, 6);
    expect(await page.getByTestId('scale-source').textContent()).toContain('TIFF resolution tags');
    const box = await page.getByTestId('stage-wrap').boundingBox();
    if (!box) throw new Error('no image view');
    const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
    await page.mouse.move(box.x + view.x + 400 * view.scale, box.y + view.y + 300 * view.scale);
    await expect.poll(() => page.getByTestId('readout').textContent()).toMatch(/x 400\.0 px, y 300\.0 px\s+—\s+x 3000 µm, y 2250 µm/);
    await page.mouse.wheel(0, -300);
    await expect.poll(async () => JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}').scale).toBeGreaterThan(view.scale);
    await expect.poll(() => page.getByTestId('readout').textContent()).toMatch(/x 400\.0 px, y 300\.0 px/);

    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });
});
