/**
 * One writer per output folder: a second batch (or merge, report) on a folder in use refuses at
 * once with one line and exit 1; a stale lock (process gone, same host) is taken over with a note;
 * a lock of another host is never taken over. Uses the stand-in processor (batch-test-processor.mjs).
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { acquireOutputLock, LOCK_NAME } from '../../src/cli/batch/lock.js';
import { discPng, requireBuild, runCli, spawnCli, tempDir, write } from './batch-helpers.js';

beforeAll(requireBuild);

function series(n: number): string {
  const dir = tempDir('lock-in');
  for (let i = 0; i < n; i++) write(join(dir, `img${i}.png`), discPng(32, i + 1));
  return dir;
}

async function waitFor(cond: () => boolean, ms: number): Promise<void> {
  const t0 = Date.now();
  while (!cond()) {
    if (Date.now() - t0 > ms) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 50));
  }
}

function exited(child: ReturnType<typeof spawnCli>): Promise<number | null> {
  return new Promise((res) => child.on('exit', (code) => res(code)));
}

/** A process id that is not running any more. */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', ''], { stdio: 'ignore' });
  return r.pid!;
}

describe('output folder lock', () => {
  it('a second batch, a report and a merge into a busy folder refuse at once; the first run completes', async () => {
    const input = series(4);
    const out = join(tempDir('lock-out'), 'out');
    const first = spawnCli(['batch', input, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress'], { FRACTOZONE_TEST_DELAY_MS: '700' });
    let firstErr = '';
    first.stderr!.on('data', (d: Buffer) => (firstErr += d.toString()));
    const firstExit = exited(first);
    await waitFor(() => existsSync(join(out, LOCK_NAME)), 20_000);
    const lock = JSON.parse(readFileSync(join(out, LOCK_NAME), 'utf8')) as { pid: number; host: string; command: string };
    expect(lock).toMatchObject({ pid: first.pid, host: hostname(), command: 'batch' });

    const t0 = Date.now();
    const second = runCli(['batch', input, '--out', out, '--pixel-size', '2um', '--no-progress']);
    expect(Date.now() - t0).toBeLessThan(5000); // node start-up + lock check, no waiting
    expect(second.code).toBe(1);
    const lines = second.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^fractozone: error \[OUTPUT_BUSY\]: output folder ".*" is in use by another fractozone run \(batch, pid \d+ on this host, started /);
    expect(lines[0]).toContain(`pid ${first.pid}`);

    const report = runCli(['report', out]);
    expect(report.code).toBe(1);
    expect(report.stderr).toContain('[OUTPUT_BUSY]');
    const merged = runCli(['merge', out, '--out', join(tempDir('lock-merge'), 'all')]);
    expect(merged.code).toBe(1);
    expect(merged.stderr).toContain('[OUTPUT_BUSY]');
    const mergeInto = runCli(['merge', series(0), '--out', out]);
    expect(mergeInto.code).not.toBe(0);

    expect(await firstExit).toBe(0);
    expect(firstErr).not.toContain('error');
    expect(existsSync(join(out, LOCK_NAME))).toBe(false); // released
    const rows = readFileSync(join(out, 'results.csv'), 'utf8').trim().split('\n');
    expect(rows).toHaveLength(5); // header + 4 images, nothing doubled by the refused runs
  });

  it('a stale lock (process gone, this host) is taken over with a note', () => {
    const input = series(2);
    const out = join(tempDir('lock-stale'), 'out');
    const pid = deadPid();
    write(join(out, LOCK_NAME), JSON.stringify({ schema: 'fractozone.lock/1', pid, host: hostname(), startedAt: '2026-01-01T00:00:00.000Z', procStart: null, command: 'batch', token: 'old' }));
    const r = runCli(['batch', input, '--out', out, '--pixel-size', '2um', '--no-progress']);
    expect(r.code).toBe(0);
    expect(r.stderr).toContain(`batch: note: took over the lock of an earlier run that is no longer running (batch, pid ${pid} on this host`);
    expect(existsSync(join(out, LOCK_NAME))).toBe(false);
    expect(existsSync(join(out, 'results.csv'))).toBe(true);
  });

  it('a live pid that belongs to a later process (other start time) counts as stale', () => {
    const out = join(tempDir('lock-reuse'), 'out');
    // the test's parent process is alive; a wrong kernel start time says the lock was not its
    write(join(out, LOCK_NAME), JSON.stringify({ schema: 'fractozone.lock/1', pid: process.ppid, host: hostname(), startedAt: 'x', procStart: '1', command: 'batch', token: 'old' }));
    const notes: string[] = [];
    const lock = acquireOutputLock(out, 'test', (m) => notes.push(m));
    try {
      expect(notes.join('\n')).toContain('took over');
    } finally {
      lock.release();
    }
  });

  it('a lock of another host is never taken over; the message names the file to remove', () => {
    const input = series(1);
    const out = join(tempDir('lock-host'), 'out');
    write(join(out, LOCK_NAME), JSON.stringify({ schema: 'fractozone.lock/1', pid: deadPid(), host: 'cluster-node-17', startedAt: '2026-01-01T00:00:00.000Z', procStart: null, command: 'batch', token: 'other' }));
    const r = runCli(['batch', input, '--out', out, '--pixel-size', '2um', '--no-progress']);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('on host "cluster-node-17"');
    expect(r.stderr).toContain(`remove "${join(out, LOCK_NAME)}"`);
    expect(existsSync(join(out, 'results.csv'))).toBe(false);
  });

  it('within one process the lock is exclusive and released by release()', () => {
    const out = join(tempDir('lock-unit'), 'out');
    const a = acquireOutputLock(out, 'first', () => {});
    expect(() => acquireOutputLock(out, 'second', () => {})).toThrowError(expect.objectContaining({ code: 'OUTPUT_BUSY' }));
    a.release();
    const b = acquireOutputLock(out, 'third', () => {});
    expect(JSON.parse(readFileSync(join(out, LOCK_NAME), 'utf8')).command).toBe('third');
    b.release();
    expect(existsSync(join(out, LOCK_NAME))).toBe(false);
  });

  it('a lock file that is not fractozone\'s is not removed', () => {
    const out = join(tempDir('lock-foreign'), 'out');
    write(join(out, LOCK_NAME), 'something else');
    expect(() => acquireOutputLock(out, 'x', () => {})).toThrowError(expect.objectContaining({ code: 'OUTPUT_BUSY' }));
    expect(readFileSync(join(out, LOCK_NAME), 'utf8')).toBe('something else');
    writeFileSync(join(out, LOCK_NAME), '');
  });
});
