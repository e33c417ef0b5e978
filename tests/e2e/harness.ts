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

export async function launchApp(opts: { path?: string } = {}): Promise<AppSession> {
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
      viewport: { width: 1400, height: 900 },
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
