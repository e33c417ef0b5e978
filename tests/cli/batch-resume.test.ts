import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { discPng, folderDiff, requireBuild, runCli, spawnCli, tempDir, uniformPng, write } from './batch-helpers.js';

const N = 10;

function makeInputs(dir: string): void {
  for (let i = 0; i < N - 2; i++) write(join(dir, `img${String(i).padStart(2, '0')}.png`), discPng(40, 100 + i));
  write(join(dir, 'norim.png'), uniformPng(32));
  write(join(dir, 'broken.png'), discPng(40, 7).slice(0, 90));
}

describe('batch --resume after kill -9', () => {
  let inDir: string;
  let clean: string;
  beforeAll(() => {
    requireBuild();
    inDir = tempDir('res-in');
    makeInputs(inDir);
    clean = join(tempDir('res-clean'), 'OUT');
    const r = runCli(['batch', inDir, '--out', clean, '--jobs', '2']);
    expect(r.code, r.stderr).toBe(1); // broken.png fails
  });

  it('a run killed midway, then resumed, gives the same files as an uninterrupted run', async () => {
    const out = join(tempDir('res-kill'), 'OUT');
    const child = spawnCli(['batch', inDir, '--out', out, '--jobs', '2'], { FRACTOZONE_TEST_DELAY_MS: '250' });
    const exited = new Promise<number | null>((res) => child.on('exit', (code) => res(code)));
    const resultsDir = join(out, 'results');
    const t0 = Date.now();
    let done = 0;
    while (Date.now() - t0 < 60_000) {
      done = existsSync(resultsDir) ? readdirSync(resultsDir).filter((n) => n.endsWith('.json') && !n.startsWith('.')).length : 0;
      if (done >= 3) break;
      await new Promise((r) => setTimeout(r, 20));
    }
    // the worker processes: forked from the batch, one per --jobs, each started --single-threaded
    const workers = execFileSync('ps', ['-o', 'pid=', '--ppid', String(child.pid)], { encoding: 'utf8' })
      .split('\n')
      .map((l) => Number(l.trim()))
      .filter((n) => n > 0);
    expect(workers.length).toBe(2);
    for (const pid of workers) {
      const cmd = readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
      expect(cmd).toContain('--single-threaded');
      expect(cmd.some((a) => a.endsWith('batch/worker.js'))).toBe(true);
    }
    child.kill('SIGKILL');
    await exited;
    // orphaned workers notice the lost IPC channel and exit (they never write files themselves)
    const alive = (pid: number): boolean => {
      try {
        process.kill(pid, 0);
        return !/^\S+ \(\S+\) Z/.test(readFileSync(`/proc/${pid}/stat`, 'utf8'));
      } catch {
        return false;
      }
    };
    const tk = Date.now();
    while (workers.some(alive) && Date.now() - tk < 10_000) await new Promise((r) => setTimeout(r, 50));
    expect(workers.filter(alive)).toEqual([]);
    const afterKill = readdirSync(resultsDir).filter((n) => n.endsWith('.json') && !n.startsWith('.'));
    expect(afterKill.length).toBeGreaterThanOrEqual(3);
    expect(afterKill.length).toBeLessThan(N); // really interrupted
    expect(existsSync(join(out, 'results.csv'))).toBe(false); // summary files come at the end
    for (const n of afterKill) expect(() => JSON.parse(readFileSync(join(resultsDir, n), 'utf8'))).not.toThrow(); // never half-written

    const r = runCli(['batch', inDir, '--out', out, '--jobs', '2', '--resume', '--json']);
    expect(r.code, r.stderr).toBe(1);
    const s = JSON.parse(r.stdout);
    const okBefore = afterKill.filter((n) => n !== 'broken.png.json').length;
    expect(s.skipped).toBe(okBefore); // finished images were not redone (failed ones are retried)
    expect(s.total).toBe(N);
    expect(folderDiff(clean, out)).toEqual([]);
  });

  it('--resume redoes an image whose content or parameters changed', () => {
    const out = join(tempDir('res-chg'), 'OUT');
    const d = tempDir('res-chg-in');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'b.png'), discPng(32, 2));
    expect(runCli(['batch', d, '--out', out, '--jobs', '1']).code).toBe(0);
    const same = JSON.parse(runCli(['batch', d, '--out', out, '--jobs', '1', '--resume', '--json']).stdout);
    expect(same.skipped).toBe(2);
    write(join(d, 'b.png'), discPng(32, 3));
    const changed = JSON.parse(runCli(['batch', d, '--out', out, '--jobs', '1', '--resume', '--json']).stdout);
    expect(changed.skipped).toBe(1);
    const params = JSON.parse(runCli(['batch', d, '--out', out, '--jobs', '1', '--resume', '--json', '--pixel-size', '3um']).stdout);
    expect(params.skipped).toBe(0);
  });
});
