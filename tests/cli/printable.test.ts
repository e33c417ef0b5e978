/**
 * Messages quoting file names or file content are printable (no control characters reach the
 * terminal); CSV and JSON keep the exact names. Spawns the built CLI (`npm run build` first).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { discPng, requireBuild, runCli, tempDir, write } from './batch-helpers.js';

// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;

function u32be(v: number): number[] {
  return [(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255];
}
/** PNG signature + IHDR + a chunk named with NUL/ESC bytes, cut short. */
function oddChunkPng(): Uint8Array {
  const ihdr = [...u32be(13), 0x49, 0x48, 0x44, 0x52, ...u32be(4), ...u32be(4), 8, 0, 0, 0, 0, 0, 0, 0, 0];
  return new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...ihdr, ...u32be(1000), 0x00, 0x1b, 0x5b, 0x59, 1, 2, 3, 4, 5, 6, 7, 8]);
}

beforeAll(requireBuild);

describe('printable messages', () => {
  it('info: a crafted chunk name and a file name with ESC are escaped on stderr, exit 1', () => {
    const dir = tempDir('printable-info');
    const name = 'evil\u001b]0;title\u0007\u001b[2J.png';
    write(join(dir, name), oddChunkPng());
    const r = runCli(['info', join(dir, name)]);
    expect(r.code).toBe(1);
    expect(r.stderr).not.toMatch(CONTROL);
    expect(r.stderr).toContain('\\x00\\x1b[Y');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    // several files: each error line names the file, escaped
    const r2 = runCli(['info', join(dir, name), join(dir, 'missing\u001b.png')]);
    expect(r2.code).toBe(1);
    expect(r2.stderr).not.toMatch(CONTROL);
    expect(r2.stderr).toContain('evil\\x1b]0;title\\x07\\x1b[2J.png');
    expect(r2.stderr).toContain('missing\\x1b.png');
    expect(r2.stdout).not.toMatch(CONTROL);
  });

  it('batch: stderr escaped, CSV and JSON keep the exact names (RFC 4180 quoting)', () => {
    const dir = tempDir('printable-batch');
    const odd = 'we"ird,\u001b[2Jname\nline.png';
    write(join(dir, 'in', odd), new TextEncoder().encode('not an image'));
    write(join(dir, 'in', 'good.png'), discPng(40, 3));
    const out = join(dir, 'out\u001b[31m');
    const r = runCli(['batch', join(dir, 'in'), '--out', out, '--pixel-size', '2um', '--jobs', '1']);
    expect(r.code).toBe(1);
    expect(r.stderr).not.toMatch(CONTROL);
    expect(r.stderr).toContain('out\\x1b[31m');
    const csv = Papa.parse<Record<string, string>>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true });
    expect(csv.errors).toEqual([]);
    expect(csv.data.map((row) => row.file).sort()).toEqual(['good.png', odd].sort());
    const jsonl = readFileSync(join(out, 'results.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as { file: string });
    expect(jsonl.map((j) => j.file).sort()).toEqual(['good.png', odd].sort());
  });

  it('a usage error quoting a bad option value is escaped (commander output)', () => {
    const r = runCli(['info', '--max-pixels', '1\u001b[2J', 'x.png']);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toMatch(CONTROL);
    const r2 = runCli(['info', '--no-such-\u001b[2J']);
    expect(r2.code).toBe(2);
    expect(r2.stderr).not.toMatch(CONTROL);
    expect(r2.stderr).toContain('\\x1b[2J');
  });
});
