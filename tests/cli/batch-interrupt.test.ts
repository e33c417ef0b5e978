/**
 * Graceful interrupt of a batch: the first SIGINT/SIGTERM stops handing out images, lets the
 * running ones finish (or stops them after the grace period), rewrites the summaries from what is
 * done, says `interrupted: k of n done; run again with --resume` and exits 130; a second SIGINT
 * aborts at once. Nothing half-written and no lock remain. Uses the stand-in processor.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { LOCK_NAME } from '../../src/cli/batch/lock.js';
import { CLI, discPng, listTree, requireBuild, ROOT, runCli, spawnCli, tempDir, TEST_PROCESSOR, write } from './batch-helpers.js';

beforeAll(requireBuild);

function series(n: number, extra: string[] = []): string {
  const dir = tempDir('int-in');
  for (let i = 0; i < n; i++) write(join(dir, `img${i}.png`), discPng(32, i + 1));
  for (const name of extra) write(join(dir, name), discPng(32, 99));
  return dir;
}

function resultCount(out: string): number {
  const d = join(out, 'results');
  return existsSync(d) ? readdirSync(d).filter((n) => n.endsWith('.json') && !n.startsWith('.')).length : 0;
}

async function waitFor(cond: () => boolean, ms: number): Promise<void> {
  const t0 = Date.now();
  while (!cond()) {
    if (Date.now() - t0 > ms) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 50));
  }
}

interface Ended {
  code: number | null;
  stderr: string;
  ms: number;
}

function start(args: string[], env: Record<string, string>): { child: ReturnType<typeof spawnCli>; ended: Promise<Ended>; t: () => number } {
  const child = spawnCli(args, env);
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
  let tSignal = Date.now();
  const ended = new Promise<Ended>((res) => child.on('exit', (code) => res({ code, stderr, ms: Date.now() - tSignal })));
  return { child, ended, t: () => (tSignal = Date.now()) };
}

function noLeftovers(out: string): void {
  const files = listTree(out);
  expect(files.filter((f) => f.endsWith('.tmp'))).toEqual([]);
  expect(files).not.toContain(LOCK_NAME);
}

describe('batch interrupt', () => {
  it('first SIGINT: running images finish, summaries hold what is done, exit 130 with the --resume hint; --resume completes', async () => {
    const input = series(8);
    const out = join(tempDir('int-out'), 'out');
    const run = start(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress'], { FRACTOZONE_TEST_DELAY_MS: '600' });
    await waitFor(() => resultCount(out) >= 2, 30_000);
    run.t();
    run.child.kill('SIGINT');
    const e = await run.ended;
    expect(e.code).toBe(130);
    expect(e.ms).toBeLessThan(5000); // the image in progress finished (≈ 0.6 s), nothing new started
    const m = /interrupted: (\d+) of 8 done; run again with --resume/.exec(e.stderr);
    expect(m, e.stderr).not.toBeNull();
    const k = Number(m![1]);
    expect(k).toBeGreaterThanOrEqual(2);
    expect(k).toBeLessThan(8);
    expect(resultCount(out)).toBe(k);
    const csvRows = readFileSync(join(out, 'results.csv'), 'utf8').trim().split('\n').length - 1;
    expect(csvRows).toBe(k); // rewritten from what is done
    expect(existsSync(join(out, 'report.html'))).toBe(true);
    noLeftovers(out);

    const resumed = runCli(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress', '--resume']);
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toContain(`8 images: ${8 - k} ok, 0 no band, 0 failed, ${k} skipped`);
    noLeftovers(out);
  });

  it('SIGTERM behaves like the first SIGINT', async () => {
    const input = series(6);
    const out = join(tempDir('int-term'), 'out');
    const run = start(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '2', '--no-progress'], { FRACTOZONE_TEST_DELAY_MS: '500' });
    await waitFor(() => resultCount(out) >= 1, 30_000);
    run.child.kill('SIGTERM');
    const e = await run.ended;
    expect(e.code).toBe(130);
    expect(e.stderr).toMatch(/interrupted: \d+ of 6 done; run again with --resume/);
    noLeftovers(out);
  });

  it('an image still running after the grace period is stopped and not recorded', async () => {
    const input = series(2, ['zz-hang.png']);
    const out = join(tempDir('int-grace'), 'out');
    const run = start(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress'], {});
    await waitFor(() => resultCount(out) >= 2, 30_000); // img0, img1 done; zz-hang.png runs for ever
    run.t();
    run.child.kill('SIGINT');
    const e = await run.ended;
    expect(e.code).toBe(130);
    expect(e.ms).toBeGreaterThan(4000); // waited the 5 s grace period
    expect(e.ms).toBeLessThan(15_000);
    expect(e.stderr).toContain('interrupted: 2 of 3 done; run again with --resume');
    expect(existsSync(join(out, 'results', 'zz-hang.png.json'))).toBe(false);
    noLeftovers(out);
  });

  it('a second SIGINT aborts at once', async () => {
    const input = series(1, ['zz-hang.png']);
    const out = join(tempDir('int-abort'), 'out');
    const run = start(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress'], {});
    await waitFor(() => resultCount(out) >= 1, 30_000);
    run.child.kill('SIGINT');
    await new Promise((r) => setTimeout(r, 300));
    run.t();
    run.child.kill('SIGINT');
    const e = await run.ended;
    expect(e.code).toBe(130);
    expect(e.ms).toBeLessThan(2000);
    expect(e.stderr).toContain('interrupted: stopped at once; 1 of 2 done; run again with --resume');
    noLeftovers(out);
  });

  it('Ctrl-C on a terminal (SIGINT to the whole process group, workers included) is the same graceful stop', async () => {
    const input = series(6);
    const out = join(tempDir('int-group'), 'out');
    const child = spawn(process.execPath, [CLI, 'batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '2', '--no-progress'], {
      cwd: ROOT,
      env: { ...process.env, FRACTOZONE_BATCH_PROCESSOR: TEST_PROCESSOR, FRACTOZONE_TEST_DELAY_MS: '500' },
      stdio: ['ignore', 'pipe', 'pipe'],
      detached: true, // its own process group, as a shell gives a foreground job
    });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    const code = new Promise<number | null>((res) => child.on('exit', (c) => res(c)));
    await waitFor(() => resultCount(out) >= 1, 30_000);
    process.kill(-child.pid!, 'SIGINT');
    expect(await code).toBe(130);
    expect(stderr).toMatch(/interrupted: \d+ of 6 done; run again with --resume/);
    expect(stderr).not.toContain('PROCESSING_FAILED'); // no worker died of the signal
    const errors = readdirSync(join(out, 'results')).filter((n) => readFileSync(join(out, 'results', n), 'utf8').includes('batch-error'));
    expect(errors).toEqual([]);
    noLeftovers(out);
  });
});
