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
    child.kill('SIGKILL');
    await exited;
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
