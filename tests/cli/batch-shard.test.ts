import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { MATERIAL_SHEET, discPng, folderDiff, requireBuild, runCli, tempDir, uniformPng, write } from './batch-helpers.js';

describe('batch --shard i/n + merge', () => {
  let inDir: string;
  let whole: string;
  beforeAll(() => {
    requireBuild();
    inDir = tempDir('sh-in');
    write(join(inDir, 'materials.json'), MATERIAL_SHEET);
    const rows = ['file,notch,strain_rate_per_s,material'];
    for (let i = 0; i < 7; i++) {
      const f = `${i % 2 ? 'p' : 'q'}/img${i}.png`;
      write(join(inDir, f), discPng(36, 10 + i));
      rows.push(`${f},${i % 2 ? 'U' : 'V'},${[0.001, 1, 100][i % 3]},materials.json:QV-3 (invented alloy)`);
    }
    write(join(inDir, 'q/flat.png'), uniformPng(30));
    write(join(inDir, 'manifest.csv'), rows.join('\n') + '\n');
    whole = join(tempDir('sh-whole'), 'OUT');
    const r = runCli(['batch', inDir, '--manifest', join(inDir, 'manifest.csv'), '--out', whole, '--jobs', '2']);
    expect(r.code, r.stderr).toBe(0);
  });

  it('shard 1/2 + shard 2/2 + merge equals one whole run', () => {
    const base = tempDir('sh-parts');
    const s1 = join(base, 's1');
    const s2 = join(base, 's2');
    for (const [i, o] of [
      [1, s1],
      [2, s2],
    ] as const) {
      const r = runCli(['batch', inDir, '--manifest', join(inDir, 'manifest.csv'), '--out', o, '--jobs', '2', '--shard', `${i}/2`]);
      expect(r.code, r.stderr).toBe(0);
    }
    const n1 = readdirSync(join(s1, 'results')).length;
    const n2 = readdirSync(join(s2, 'results')).length;
    expect([n1, n2]).toEqual([4, 4]); // 8 images, k mod 2
    const all = join(base, 'ALL');
    const m = runCli(['merge', s1, s2, '--out', all, '--json']);
    expect(m.code, m.stderr).toBe(0);
    expect(JSON.parse(m.stdout).images).toBe(8);
    expect(folderDiff(whole, all)).toEqual([]);
  });

  it('report rebuilds the same summary files from the per-image results', () => {
    const before = readFileSync(join(whole, 'report.html'));
    const csv = readFileSync(join(whole, 'results.csv'));
    const r = runCli(['report', whole]);
    expect(r.code, r.stderr).toBe(0);
    expect(readFileSync(join(whole, 'report.html')).equals(before)).toBe(true);
    expect(readFileSync(join(whole, 'results.csv')).equals(csv)).toBe(true);
  });

  it('rejects a bad --shard and a merge into one of its sources', () => {
    expect(runCli(['batch', inDir, '--out', join(tempDir('sh-bad'), 'o'), '--shard', '3/2']).code).toBe(2);
    expect(runCli(['merge', whole, '--out', whole]).code).toBe(2);
  });
});
