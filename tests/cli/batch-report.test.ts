import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { CAUTION_TEXT } from '../../src/core/report/html.js';
import { MATERIAL_SHEET, discPng, requireBuild, runCli, tempDir, uniformPng, write } from './batch-helpers.js';

const CHROMIUM = '/usr/bin/chromium';
const SKIP = process.env.FRACTOZONE_SKIP_E2E === '1';

describe.skipIf(SKIP)('batch report.html in Chromium (headless)', () => {
  let out: string;
  beforeAll(() => {
    if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: install Chromium or set FRACTOZONE_SKIP_E2E=1 to skip the browser test`);
    requireBuild();
    const d = tempDir('rep-in');
    write(join(d, 'materials.json'), MATERIAL_SHEET);
    const rows = ['file,specimen_id,notch,strain_rate_per_s,pixel_size_um,material'];
    const rates = [0.001, 0.001, 1, 1, 100, 100];
    rates.forEach((rate, i) => {
      for (const notch of ['U', 'V']) {
        const f = `${notch}/s${i}.png`;
        write(join(d, f), discPng(64, i * 7 + (notch === 'U' ? 1 : 2)));
        rows.push(`${f},${notch}${i},${notch},${rate},3,materials.json:QV-3 (invented alloy)`);
      }
    });
    write(join(d, 'flat.png'), uniformPng(40));
    write(join(d, 'bad <name>.png'), 'not a png');
    write(join(d, 'manifest.csv'), rows.join('\n') + '\n');
    out = join(tempDir('rep-out'), 'OUT');
    const r = runCli(['batch', d, '--manifest', join(d, 'manifest.csv'), '--out', out, '--jobs', '2']);
    expect(r.code, r.stderr).toBe(1);
  });

  it('is self-contained: no script, no external URL, thumbnails as data: URIs, caution present', () => {
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//i);
    expect(html).not.toMatch(/@import|url\(/i);
    expect(html).toContain('src="data:image/png;base64,');
    expect(html).toContain(CAUTION_TEXT.replace(/’/g, '\u2019'));
    expect(html).toContain('bad &lt;name&gt;.png'); // file names are escaped
  });

  it('renders without console errors, one summary row per image, plots present', async () => {
    const browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
    });
    try {
      const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
      const errors: string[] = [];
      const requests: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error') errors.push(m.text());
      });
      page.on('pageerror', (e) => errors.push(String(e)));
      page.on('request', (r) => {
        if (!r.url().startsWith('file:') && !r.url().startsWith('data:')) requests.push(r.url());
      });
      await page.goto(`file://${join(out, 'report.html')}`);
      expect(errors).toEqual([]);
      expect(requests).toEqual([]);
      expect(await page.locator('#summary tr.image-row').count()).toBe(14);
      expect(await page.locator('svg.series').count()).toBe(1);
      // 2 notches × 3 strain rates = 6 group points, 3 L(ε̇) points
      expect(await page.locator('svg.series circle.series-point').count()).toBe(6);
      expect(await page.locator('svg.series rect.l-point').count()).toBe(3);
      expect(await page.locator('#groups tr.group-row').count()).toBe(6);
      expect(await page.locator('svg.histogram').count()).toBe(13); // every non-failed image
      expect(await page.locator('svg.polar').count()).toBe(13);
      const thumbs = page.locator('.card img');
      expect(await thumbs.count()).toBe(13);
      // thumbnails really decode (naturalWidth > 0) and are at most 320 px wide
      const widths = await thumbs.evaluateAll((els) => els.map((e) => (e as HTMLImageElement).naturalWidth));
      for (const w of widths) {
        expect(w).toBeGreaterThan(0);
        expect(w).toBeLessThanOrEqual(320);
      }
      await page.screenshot({ path: '/tmp/fractozone-batch-report.png', fullPage: true });
    } finally {
      await browser.close();
    }
  });
});
