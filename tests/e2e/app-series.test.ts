/**
 * Several images in one session (headless Chromium): a second image's inputs are its own; undo on
 * it leaves the first image alone; the series material applies to every image without its own; a
 * strain rate without a rate law is said beside the material form and the comparison is cleared;
 * an input that needs a full run marks the result out of date and turns saving off.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKIP_E2E, currentMean, launchApp, openImage, repoRoot, setPixelSize, showImage, typeNumber, waitCurrent, waitForStart, type AppSession } from './harness.js';

const cli = join(repoRoot, 'dist/cli/main.js');

describe.skipIf(SKIP_E2E)('several images in one session', () => {
  let s: AppSession;
  let dir: string;
  let a: string;
  let b: string;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'fractozone-series-'));
    a = join(dir, 'invented-a.png');
    b = join(dir, 'invented-b.png');
    // invented images from the project's renderer; B has a 500 µm bar
    execFileSync(process.execPath, [cli, 'render', '--out', a, '--seed', '21', '--size', '900x700', '--pixel-size', '9um'], { cwd: repoRoot });
    execFileSync(process.execPath, [cli, 'render', '--out', b, '--seed', '22', '--size', '900x700', '--pixel-size', '8um', '--bar', '500um'], { cwd: repoRoot });
    s = await launchApp();
  });
  afterAll(async () => {
    await s?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('a second image has its own inputs, and undo on it leaves the first alone', async () => {
    const { page } = s;
    await waitForStart(page);
    await openImage(page, a);
    await setPixelSize(page, 9);
    await page.getByTestId('bar-um').fill('1000');
    await page.getByTestId('find-boundary').click();
    const meanA = await currentMean(page);

    await openImage(page, b);
    expect(await page.getByTestId('image-item').count()).toBe(3);
    // nothing of image A's inputs shows on image B
    expect(await page.getByTestId('typed-um').inputValue()).toBe('');
    expect(await page.getByTestId('bar-um').inputValue()).toBe('');
    expect(await page.getByTestId('scale-source').getAttribute('data-um-per-px')).not.toBe('9');
    expect(await page.getByTestId('result-state').getAttribute('data-state')).toBe('none');

    await page.getByTestId('bar-um').fill('500');
    await page.getByTestId('find-bar').click();
    // B's own bar length (500 µm) is used: about B's 8 µm/px (A's 1000 µm would give 16)
    await expect.poll(async () => Math.abs(Number(await page.getByTestId('scale-source').getAttribute('data-um-per-px')) - 8), { timeout: 30_000 }).toBeLessThan(0.2);
    await page.getByTestId('find-boundary').click();
    await waitCurrent(page);

    // undo on B: the full run, then the scale bar — only B's own edits
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.getByTestId('result-state').getAttribute('data-state')).toBe('none');
    expect(await page.getByTestId('find-boundary').textContent()).toBe('Find boundary');
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.getByTestId('bar-um').inputValue()).toBe('');

    await showImage(page, 'invented-a.png');
    expect(await page.getByTestId('typed-um').inputValue()).toBe('9');
    expect(await currentMean(page)).toBe(meanA);
  });

  it('the series material applies to every image; a strain rate without a law is said beside the form', async () => {
    const { page } = s;
    // on A (no material of its own): K_c = 48 MPa·√m, σ0 = 1150 MPa → L = (1/π)(K_c/σ0)² = 554.56 µm
    // (Taylor, The Theory of Critical Distances, Elsevier 2007)
    await typeNumber(page, 'kc', '48');
    await typeNumber(page, 'sigma0', '1150');
    const L = (1 / Math.PI) * (48 / 1150) ** 2 * 1e6;
    await waitCurrent(page);
    await expect.poll(async () => Number(await page.getByTestId('l-um').getAttribute('data-value'))).toBeCloseTo(L, 6);
    expect(await page.getByTestId('verdict').textContent()).toMatch(/agrees|band-wider|band-narrower|inconclusive/);

    await typeNumber(page, 'strain-rate', '0.001');
    const problem = page.locator('section', { has: page.getByTestId('material-scope') }).getByTestId('material-problem');
    await expect.poll(() => problem.textContent()).toContain('A strain rate needs a strain-rate law');
    await waitCurrent(page);
    expect(await page.getByTestId('tcd-table').count()).toBe(0);
    expect(await page.getByTestId('verdict-line').count()).toBe(0);

    // B uses the same series material (and has no strain rate): its comparison is there
    await showImage(page, 'invented-b.png');
    await page.getByTestId('find-boundary').click();
    await waitCurrent(page);
    await expect.poll(async () => Number(await page.getByTestId('l-um').getAttribute('data-value'))).toBeCloseTo(L, 6);
    expect(await page.getByTestId('material-problem').count()).toBe(0);

    // B's own material from the sample sheet (K_c 48 ± 2.5, σ0 1150 ± 45): L with a 95 % interval
    await page.getByTestId('material-scope').selectOption('own');
    await page.getByTestId('material-sheet').setInputFiles(join(repoRoot, 'samples/materials.json'));
    await expect.poll(() => page.getByTestId('material-choice').inputValue()).toBe('FZ-7 (invented alloy)');
    await waitCurrent(page);
    await expect.poll(() => page.getByTestId('tcd-table').textContent()).toMatch(/95 % interval of L\d+(\.\d+)? – \d+(\.\d+)? µm/);
    // A keeps the series material (typed values, no sd): no interval there
    await showImage(page, 'invented-a.png');
    expect(await page.getByTestId('material-scope').inputValue()).toBe('series');
  });

  it('a change that needs a full run marks the result out of date and turns saving off', async () => {
    const { page } = s;
    await typeNumber(page, 'window-um', '150');
    await expect.poll(() => page.getByTestId('result-state').getAttribute('data-state')).toBe('stale');
    expect(await page.getByTestId('result-state').textContent()).toContain('Find boundary');
    expect(await page.getByTestId('export-json').isDisabled()).toBe(true);
    expect(await page.getByTestId('export-html').isDisabled()).toBe(true);
    // the window is a series setting: image A is out of date too
    expect(await page.locator('[data-testid=image-item][data-name="invented-a.png"]').getAttribute('data-state')).toBe('stale');
    await page.getByTestId('find-boundary').click();
    await waitCurrent(page);
    expect(await page.getByTestId('export-json').isDisabled()).toBe(false);

    // a letter shortcut typed in a number field is not swallowed: it leaves the field and acts
    await page.getByTestId('rays').click();
    await page.keyboard.press('x');
    expect(await page.getByTestId('tool-remove-vertex').getAttribute('class')).toBe('on');
    expect(await page.getByTestId('rays').inputValue()).toBe('360');

    expect(s.consoleErrors).toEqual([]);
    expect(s.foreignRequests).toEqual([]);
  });
});
