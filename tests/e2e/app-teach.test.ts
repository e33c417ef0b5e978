/**
 * Teach mode end to end in headless Chromium, on the bundled invented sample (1600×1200 px, about
 * 2 MP, with exact truth): three strokes painted with the mouse (outside, rim band, core) along
 * arcs taken from the truth; the class map appears and covers each class about as the truth does;
 * the model file saved is fractozone.model/1 with the SHA-256 the app shows; the command line
 * measures with that file exactly what the app measures after "Apply to all images"; a second
 * image is measured with the model too; the saved file opens again and, applied right after
 * "Without model", measures the shown image with it again. The time from the end of the
 * last stroke to the class map on screen is printed (the target ≤ 1 s is a bench figure, not
 * asserted here).
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SKIP_E2E, currentMean, downloadOf, launchApp, openImage, repoRoot, setPixelSize, showImage, waitCurrent, waitForStart, type AppSession } from './harness.js';

const cli = join(repoRoot, 'dist/cli/main.js');
const sampleDir = join(repoRoot, 'dist-app/sample');

interface Truth {
  widthPx: number;
  heightPx: number;
  umPerPxX: number;
  centre: { x: number; y: number };
  outerRadiusPxByAngle: number[];
  boundaryRadiusPxByAngle: number[];
}

/** Drags the mouse along an arc (image px, degrees counter-clockwise from +x) with the current tool. */
async function paintArc(page: Page, c: { x: number; y: number }, radius: (deg: number) => number, fromDeg: number, toDeg: number): Promise<void> {
  const view = JSON.parse((await page.getByTestId('stage-wrap').getAttribute('data-view')) ?? '{}') as { scale: number; x: number; y: number };
  const box = await page.getByTestId('stage-wrap').boundingBox();
  if (!box) throw new Error('no image view');
  const at = (deg: number) => {
    const t = (deg * Math.PI) / 180;
    const r = radius(deg);
    return { x: box.x + view.x + (c.x + r * Math.cos(t)) * view.scale, y: box.y + view.y + (c.y - r * Math.sin(t)) * view.scale };
  };
  const p0 = at(fromDeg);
  await page.mouse.move(p0.x, p0.y);
  await page.mouse.down();
  for (let d = fromDeg; d <= toDeg; d += 4) {
    const p = at(d);
    await page.mouse.move(p.x, p.y);
  }
  await page.mouse.up();
}

describe.skipIf(SKIP_E2E)('teach mode in Chromium', () => {
  let s: AppSession;
  let dir: string;
  let truth: Truth;
  let sample: string;
  let modelFile: string;
  let sha: string;
  let sessionFile: string;
  let sessionMean: number;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'fractozone-teach-'));
    const info = JSON.parse(readFileSync(join(sampleDir, 'sample.json'), 'utf8')) as { file: string };
    const name = info.file.split('/').pop() as string;
    sample = join(sampleDir, name);
    truth = JSON.parse(readFileSync(sample.replace(/\.[^.]+$/, '.truth.json'), 'utf8'));
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('three strokes teach a model whose class map matches the truth', async () => {
    const { page } = s;
    await waitForStart(page);
    await page.getByTestId('teach-toggle').click();
    expect(await page.getByTestId('tool-teach-outside').getAttribute('class')).toBe('on');
    const c = truth.centre;
    const outer = (d: number) => truth.outerRadiusPxByAngle[Math.round(((d % 360) + 360) % 360) % 360];
    const inner = (d: number) => truth.boundaryRadiusPxByAngle[Math.round(((d % 360) + 360) % 360) % 360];
    // outside: beyond the outer edge on the left (away from the scale bar, bottom right)
    await paintArc(page, c, (d) => outer(d) + 60, 120, 240);
    await page.getByTestId('tool-teach-rim').click();
    await paintArc(page, c, (d) => (outer(d) + inner(d)) / 2, 20, 160);
    await page.getByTestId('tool-teach-core').click();
    await paintArc(page, c, (d) => 0.5 * inner(d), 0, 300);
    for (const k of [1, 2, 3]) expect(await page.getByTestId(`strokes-${k}`).getAttribute('data-count')).toBe('1');

    const shown = page.locator('[data-testid=model-shown]:not([data-fractions=""])');
    await shown.waitFor({ timeout: 60_000 });
    const fractions = ((await shown.getAttribute('data-fractions')) ?? '').split(' ').map(Number);
    // truth: areas of the rim annulus and the core disc from the truth radii, over the image
    const area = (r: number[]) => r.reduce((a, v) => a + (Math.PI * v * v) / 360, 0);
    const all = truth.widthPx * truth.heightPx;
    const want = [1 - area(truth.outerRadiusPxByAngle) / all, (area(truth.outerRadiusPxByAngle) - area(truth.boundaryRadiusPxByAngle)) / all, area(truth.boundaryRadiusPxByAngle) / all];
    for (let k = 0; k < 3; k++) expect(Math.abs(fractions[k] - want[k])).toBeLessThan(0.05);
    const total = Number(await shown.getAttribute('data-total-ms'));
    const map = Number(await shown.getAttribute('data-map-ms'));
    console.log(`teach preview on ${truth.widthPx}×${truth.heightPx} px: ${total} ms from the last stroke to the class map (class map alone ${map} ms)`);
    expect(total).toBeGreaterThan(0);
    // the preview says it is one (the forest runs on a reduced grid, interpolated between)
    expect(await page.getByTestId('teach-status').textContent()).toMatch(/preview: the model is evaluated at points \d+ px apart/);
    await page.screenshot({ path: '/tmp/fractozone-e2e-teach.png' });

    // undo takes the last stroke away; redo brings it back (the same model: no teaching needed)
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.getByTestId('strokes-3').getAttribute('data-count')).toBe('0');
    await page.keyboard.press('Control+y');
    await expect.poll(() => page.getByTestId('strokes-3').getAttribute('data-count')).toBe('1');
  });

  it('saves the model file, and the command line measures with it what the app measures', async () => {
    const { page } = s;
    const shown = page.getByTestId('model-shown');
    await expect.poll(() => page.getByTestId('teach-status').getAttribute('data-busy')).toBe('');
    sha = (await shown.getAttribute('data-sha256')) ?? '';
    modelFile = join(dir, 'taught.model.json');
    copyFileSync(await downloadOf(page, 'save-model'), modelFile);
    const bytes = readFileSync(modelFile);
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(sha);
    const model = JSON.parse(bytes.toString('utf8')) as { schema: string; classes: string[] };
    expect(model.schema).toBe('fractozone.model/1');
    expect(model.classes).toEqual(['outside', 'rim', 'core']);

    await page.getByTestId('apply-model').click();
    await page.getByTestId('model-in-use').waitFor();
    await page.locator(`[data-testid=result-model][data-sha256="${sha}"]`).waitFor({ timeout: 60_000 });
    const mean = await currentMean(page);
    const exported = JSON.parse(readFileSync(await downloadOf(page, 'export-json'), 'utf8')) as { params: Record<string, unknown>; band: { widthUm: { mean: number } }; model: { sha256: string } };
    expect(exported.model.sha256).toBe(sha);
    expect(exported.band.widthUm.mean).toBe(mean);
    // the command line with the same file and inputs gives the same number
    const cliArgs = ['measure', sample, '--model', modelFile, '--bar-length', `${(exported.params.scale as { barLengthUm: number }).barLengthUm}um`, '--json'];
    const fromCli = JSON.parse(execFileSync(process.execPath, [cli, ...cliArgs], { cwd: repoRoot, encoding: 'utf8', maxBuffer: 64 << 20 })) as { band: { widthUm: { mean: number } }; model: { sha256: string } };
    expect(fromCli.model.sha256).toBe(sha);
    expect(fromCli.band.widthUm.mean).toBeCloseTo(mean, 6);
    // the session keeps the model (checked in a fresh page at the end)
    sessionFile = join(dir, 'with-model.session.json');
    sessionMean = mean;
    copyFileSync(await downloadOf(page, 'export-session'), sessionFile);
    const session = JSON.parse(readFileSync(sessionFile, 'utf8')) as { params: { modelSha256?: string }; model?: { sha256: string; text: string } };
    expect(session.params.modelSha256).toBe(sha);
    expect(session.model?.sha256).toBe(sha);
    expect(session.model?.text).toBe(readFileSync(modelFile, 'utf8'));
  });

  it('applies the model to every open image, opens the saved file again and applies it again', async () => {
    const { page } = s;
    const copy = join(dir, 'invented-copy.jpg');
    copyFileSync(sample, copy);
    await openImage(page, copy);
    await setPixelSize(page, truth.umPerPxX);
    await page.getByTestId('find-boundary').click();
    await waitCurrent(page);
    // the series' model applies to an image opened later
    await page.locator(`[data-testid=result-model][data-sha256="${sha}"]`).waitFor({ timeout: 60_000 });
    const meanCopy = await currentMean(page);
    await showImage(page, sample.split('/').pop() as string);
    const meanSample = await currentMean(page);
    // same pixels, same model: nearly the same width (the scales differ: bar vs typed pixel size)
    expect(Math.abs(meanCopy - meanSample) / meanSample).toBeLessThan(0.02);

    // without the model: both images are measured again with the fixed rules
    await page.getByTestId('drop-model').click();
    await expect.poll(() => page.getByTestId('result-model').count(), { timeout: 60_000 }).toBe(0);
    await waitCurrent(page);

    await page.getByTestId('model-input').setInputFiles(modelFile);
    await expect.poll(() => page.getByTestId('model-shown').textContent(), { timeout: 30_000 }).toContain('taught.model.json');
    expect(await page.getByTestId('model-shown').getAttribute('data-sha256')).toBe(sha);
    // and applied again: the shown image is measured with it (not left with the fixed rules' result)
    await page.getByTestId('apply-model').click();
    await page.getByTestId('model-in-use').waitFor();
    await page.locator(`[data-testid=result-model][data-sha256="${sha}"]`).waitFor({ timeout: 60_000 });
    await waitCurrent(page);
    expect(Math.abs((await currentMean(page)) - meanSample) / meanSample).toBeLessThan(1e-9);
    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });

  it('a session saved with the model comes back measured with it, current, in a fresh page', async () => {
    const { page } = s;
    // a fresh page: no model in the engine, none in the app; the session brings it
    await page.reload();
    await waitForStart(page);
    expect(await page.getByTestId('model-in-use').count()).toBe(0);
    await page.getByTestId('open-session').setInputFiles(sessionFile);
    await page.locator(`[data-testid=result-model][data-sha256="${sha}"]`).waitFor({ timeout: 60_000 });
    await waitCurrent(page);
    expect(await page.getByTestId('model-in-use').getAttribute('data-sha256')).toBe(sha);
    expect(await currentMean(page)).toBeCloseTo(sessionMean, 6);
    expect(s.consoleErrors).toEqual([]);
  });
});
