/**
 * Disk full or unwritable output folder: one clear line, exit 1, no partial file and no lock left.
 * Two ways: write failures injected into the CLI's file-system calls (tests/cli/fixtures/
 * fail-writes.mjs: writes fail half-way with ENOSPC, or mkdir with EACCES — runs anywhere, also
 * as root where permissions do not apply), and a real full disk: a 320 kB tmpfs, mounted when
 * the test runs as root with mount permission (skipped otherwise, saying why).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { decode } from 'fast-png';
import { beforeAll, describe, expect, it } from 'vitest';
import { LOCK_NAME } from '../../src/cli/batch/lock.js';
import { CLI, discPng, listTree, requireBuild, ROOT, tempDir, TEST_PROCESSOR, write, type RunResult } from './batch-helpers.js';

const FAIL_WRITES = join(ROOT, 'tests/cli/fixtures/fail-writes.mjs');

beforeAll(requireBuild);

function runWith(args: string[], env: Record<string, string>, preload = true): RunResult {
  const r = spawnSync(process.execPath, [...(preload ? ['--import', FAIL_WRITES] : []), CLI, ...args], {
    cwd: ROOT,
    env: { ...process.env, FRACTOZONE_BATCH_PROCESSOR: TEST_PROCESSOR, ...env },
    encoding: 'utf8',
    timeout: 120_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function series(n: number, size = 48): string {
  const dir = tempDir('full-in');
  for (let i = 0; i < n; i++) write(join(dir, `img${i}.png`), discPng(size, i + 1));
  return dir;
}

/** Every file left in OUT is whole: JSON parses, PNG decodes; no temp file, no lock. */
function onlyWholeFiles(out: string): string[] {
  if (!existsSync(out)) return []; // a folder the run created and left empty is removed again
  const files = listTree(out);
  expect(files.filter((f) => f.endsWith('.tmp'))).toEqual([]);
  expect(files).not.toContain(LOCK_NAME);
  for (const f of files) {
    const p = join(out, f);
    if (f.endsWith('.json') || f.endsWith('.jsonl')) {
      const text = readFileSync(p, 'utf8');
      for (const line of f.endsWith('.jsonl') ? text.trim().split('\n').filter(Boolean) : [text]) expect(() => JSON.parse(line), f).not.toThrow();
    } else if (f.endsWith('.png')) expect(() => decode(readFileSync(p)), f).not.toThrow();
    else if (f.endsWith('.html')) expect(readFileSync(p, 'utf8').trimEnd().endsWith('</html>'), f).toBe(true);
  }
  return files;
}

function oneErrorLine(stderr: string): string {
  const lines = stderr.trim().split('\n');
  expect(lines, stderr).toHaveLength(1);
  return lines[0];
}

describe('write failures (injected)', () => {
  for (const after of [1, 3, 6, 20]) {
    it(`disk full after ${after} file writes: one line, exit 1, only whole files`, () => {
      const out = join(tempDir('full-out'), 'out');
      const r = runWith(['batch', series(6), '--out', out, '--pixel-size', '2um', '--jobs', '2', '--no-progress'], { FZ_FAIL_WRITE_AFTER: String(after) });
      expect(r.code).toBe(1);
      const line = oneErrorLine(r.stderr);
      expect(line).toMatch(/^fractozone: error \[WRITE_FAILED\]: cannot write (the lock file )?".*": no space left on the device \(ENOSPC\)$/);
      onlyWholeFiles(out);
    });
  }

  it('a read-only file system while writing results', () => {
    const out = join(tempDir('full-rofs'), 'out');
    const r = runWith(['batch', series(3), '--out', out, '--pixel-size', '2um', '--no-progress'], { FZ_FAIL_WRITE_AFTER: '2', FZ_FAIL_CODE: 'EROFS' });
    expect(r.code).toBe(1);
    expect(oneErrorLine(r.stderr)).toMatch(/read-only file system \(EROFS\)$/);
    onlyWholeFiles(out);
  });

  it('an output folder that cannot be created: one line, exit 1', () => {
    const out = join(tempDir('full-mkdir'), 'out');
    const r = runWith(['batch', series(2), '--out', out, '--pixel-size', '2um', '--no-progress'], { FZ_FAIL_MKDIR: 'EACCES' });
    expect(r.code).toBe(1);
    expect(oneErrorLine(r.stderr)).toBe(`fractozone: error [WRITE_FAILED]: cannot create folder "${out}": permission denied (EACCES)`);
  });

  it('an output path below a file (no injection): one line, exit 1', () => {
    const base = tempDir('full-notdir');
    write(join(base, 'file.txt'), 'x');
    const r = runWith(['batch', series(1), '--out', join(base, 'file.txt', 'out'), '--pixel-size', '2um', '--no-progress'], {}, false);
    expect(r.code).toBe(1);
    expect(oneErrorLine(r.stderr)).toMatch(/^fractozone: error \[WRITE_FAILED\]: cannot create folder ".*file\.txt\/out": a part of the path is a file, not a folder \(ENOTDIR\)$/);
  });

  it('report and merge stop the same way', () => {
    const out = join(tempDir('full-report'), 'out');
    const ok = runWith(['batch', series(2), '--out', out, '--pixel-size', '2um', '--no-progress'], {}, false);
    expect(ok.code).toBe(0);
    const before = readFileSync(join(out, 'results.csv'));
    const r = runWith(['report', out], { FZ_FAIL_WRITE_AFTER: '1' });
    expect(r.code).toBe(1);
    expect(oneErrorLine(r.stderr)).toMatch(/\[WRITE_FAILED\]: cannot write ".*": no space left on the device \(ENOSPC\)$/);
    expect(readFileSync(join(out, 'results.csv')).equals(before)).toBe(true); // old file intact
    onlyWholeFiles(out);
    const all = join(tempDir('full-merge'), 'all');
    const m = runWith(['merge', out, '--out', all], { FZ_FAIL_WRITE_AFTER: '3' });
    expect(m.code).toBe(1);
    expect(oneErrorLine(m.stderr)).toContain('[WRITE_FAILED]');
    onlyWholeFiles(all);
  });
});

describe('a real full disk (tmpfs)', () => {
  it('batch into a 320 kB tmpfs: ENOSPC as one line, exit 1, only whole files (needs root and mount permission)', (ctx) => {
    const mnt = join(tempDir('full-tmpfs'), 'mnt');
    mkdirSync(mnt);
    const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=320k', 'tmpfs', mnt], { encoding: 'utf8' });
    if (mounted.status !== 0) ctx.skip(`cannot mount a tmpfs here (${(mounted.stderr || String(mounted.error)).trim()}); the injected failures above still run`);
    try {
      const out = join(mnt, 'out');
      // 200×200 discs with a noisy core: ≈ 110 kB overlay + thumbnail + record per image
      const r = runWith(['batch', series(8, 200), '--out', out, '--pixel-size', '2um', '--jobs', '2', '--no-progress'], {}, false);
      expect(r.code).toBe(1);
      expect(oneErrorLine(r.stderr)).toMatch(/^fractozone: error \[WRITE_FAILED\]: cannot write ".*": no space left on the device \(ENOSPC\)$/);
      onlyWholeFiles(out);
    } finally {
      spawnSync('umount', [mnt]);
      rmSync(mnt, { recursive: true, force: true });
    }
  });
});
