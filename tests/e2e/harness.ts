/**
 * End-to-end harness: serves dist-app/ on a free port (scripts/serve.mjs), launches Debian's
 * Chromium headless through playwright-core with a fresh profile, and records console errors,
 * page errors and every request (anything outside the app's origin is a failure).
 * Set FRACTOZONE_SKIP_E2E=1 to skip; a missing /usr/bin/chromium is a test failure, not a skip.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
// @ts-expect-error plain ESM script without type declarations
import { startServer } from '../../scripts/serve.mjs';

export const CHROMIUM = process.env.FRACTOZONE_CHROMIUM ?? '/usr/bin/chromium';
export const SKIP_E2E = process.env.FRACTOZONE_SKIP_E2E === '1';
export const repoRoot = resolve(import.meta.dirname, '../..');
const distApp = join(repoRoot, 'dist-app');

export interface AppSession {
  url: string;
  origin: string;
  page: Page;
  context: BrowserContext;
  consoleErrors: string[];
  foreignRequests: string[];
  requests: string[];
  close(): Promise<void>;
}

/** Builds the app once if dist-app/ is missing (npm test builds it before vitest runs). */
export function ensureBuilt(): void {
  if (existsSync(join(distApp, 'index.html'))) return;
  execFileSync(process.execPath, [join(repoRoot, 'node_modules/vite/bin/vite.js'), 'build'], { cwd: repoRoot, stdio: 'inherit' });
}

export async function launchApp(opts: { path?: string; viewport?: { width: number; height: number } } = {}): Promise<AppSession> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(`Chromium not found at ${CHROMIUM}: install it (apt-get install chromium) or set FRACTOZONE_SKIP_E2E=1 to skip the browser tests`);
  }
  ensureBuilt();
  const server = (await startServer({ root: distApp, port: 0 })) as { url: string; close(): Promise<void> };
  const origin = new URL(server.url).origin;
  const profile = mkdtempSync(join(tmpdir(), 'fractozone-e2e-'));
  let context: BrowserContext;
  try {
    // A persistent context on a fresh temporary directory = a fresh user-data dir for each run.
    context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
        '--disable-quic',
      ],
      viewport: opts.viewport ?? { width: 1400, height: 900 },
      acceptDownloads: true,
    });
  } catch (e) {
    await server.close();
    rmSync(profile, { recursive: true, force: true });
    throw e;
  }
  const page = await context.newPage();
  const consoleErrors: string[] = [];
  const foreignRequests: string[] = [];
  const requests: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => consoleErrors.push(`pageerror: ${e.message}`));
  context.on('request', (r) => {
    const u = r.url();
    requests.push(u);
    if (u.startsWith('data:') || u.startsWith('blob:')) return;
    if (new URL(u).origin !== origin) foreignRequests.push(u);
  });
  await page.goto(server.url + (opts.path ?? ''));
  return {
    url: server.url,
    origin,
    page,
    context,
    consoleErrors,
    foreignRequests,
    requests,
    async close() {
      await context.close();
      await server.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Waits until the engine is ready and the bundled sample is open with its scale set (the app's start-up). */
export async function waitForStart(page: Page): Promise<void> {
  await page.getByTestId('engine-status').filter({ hasText: 'self-test passed' }).waitFor({ timeout: 60_000 });
  await page.getByTestId('image-item').first().waitFor({ timeout: 30_000 });
  await page.locator('[data-testid=scale-source][data-um-per-px]:not([data-um-per-px=""])').waitFor({ timeout: 30_000 });
}

/** Opens an image through the file input and waits until it is the shown image. */
export async function openImage(page: Page, file: string): Promise<void> {
  const name = file.split('/').pop() ?? file;
  await page.getByTestId('file-input').setInputFiles(file);
  await page.locator(`[data-testid=image-item][data-name="${name}"].active`).waitFor({ timeout: 30_000 });
}

/** Shows an open image by name. */
export async function showImage(page: Page, name: string): Promise<void> {
  await page.locator(`[data-testid=image-item][data-name="${name}"] button.name`).click();
  await page.locator(`[data-testid=image-item][data-name="${name}"].active`).waitFor();
}

/** Waits until the shown result is current (computed for the inputs on screen). */
export async function waitCurrent(page: Page, timeout = 60_000): Promise<void> {
  await page.locator('[data-testid=result-state][data-state=current]').waitFor({ timeout });
}

/** The mean band width shown (µm), once the result is current. */
export async function currentMean(page: Page): Promise<number> {
  await waitCurrent(page);
  return Number(await page.getByTestId('stat-mean').getAttribute('data-value'));
}

/** Types into a number field and presses Enter (fields commit on Enter or when left). */
export async function typeNumber(page: Page, testId: string, value: string): Promise<void> {
  await page.getByTestId(testId).fill(value);
  await page.getByTestId(testId).press('Enter');
}

/** Sets a typed pixel size (µm/px) with the field and its apply button. */
export async function setPixelSize(page: Page, umPerPx: number): Promise<void> {
  await page.getByTestId('typed-um').fill(String(umPerPx));
  await page.getByTestId('typed-um-apply').click();
  await page.locator(`[data-testid=scale-source][data-um-per-px="${umPerPx}"]`).waitFor();
}

/** Clicks a save button and returns the downloaded file's path. */
export async function downloadOf(page: Page, testId: string): Promise<string> {
  const dl = page.waitForEvent('download');
  await page.getByTestId(testId).click();
  const path = await (await dl).path();
  if (!path) throw new Error(`no file downloaded from ${testId}`);
  return path;
}
