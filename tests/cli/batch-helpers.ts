/** Helpers for the batch CLI tests: tiny PNG images, running the built CLI, comparing folders. */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { encode } from 'fast-png';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const CLI = join(ROOT, 'dist/cli/main.js');
export const TEST_PROCESSOR = join(ROOT, 'tests/cli/fixtures/batch-test-processor.mjs');

export function requireBuild(): void {
  if (!existsSync(CLI) || !existsSync(join(ROOT, 'dist/cli/batch/run.js'))) {
    throw new Error('the CLI is not built: run `npm run build` first');
  }
}

export function tempDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), `fz-${prefix}-`));
}

/** Gray PNG: a disc of radius 0.4·size, smooth ramp rim, pseudo-random rough core (seeded LCG). */
export function discPng(size: number, seed: number): Uint8Array {
  const data = new Uint8Array(size * size);
  let s = seed >>> 0 || 1;
  const rnd = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
  const c = (size - 1) / 2;
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const r = Math.hypot(x - c, y - c) / size;
      data[y * size + x] = r > 0.4 ? 20 : r > 0.3 ? 170 : Math.floor(60 + rnd() * 150);
    }
  }
  return encode({ width: size, height: size, data, channels: 1, depth: 8 });
}

export function uniformPng(size: number): Uint8Array {
  return encode({ width: size, height: size, data: new Uint8Array(size * size).fill(128), channels: 1, depth: 8 });
}

export function write(path: string, data: string | Uint8Array): void {
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, data);
}

export interface RunResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[], env: Record<string, string> = {}, cwd = ROOT): RunResult {
  const r = spawnSync(process.execPath, [CLI, ...args], {
    cwd,
    env: { ...process.env, FRACTOZONE_BATCH_PROCESSOR: TEST_PROCESSOR, ...env },
    encoding: 'utf8',
    timeout: 120_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

export function spawnCli(args: string[], env: Record<string, string> = {}): ReturnType<typeof spawn> {
  return spawn(process.execPath, [CLI, ...args], {
    cwd: ROOT,
    env: { ...process.env, FRACTOZONE_BATCH_PROCESSOR: TEST_PROCESSOR, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
}

/** All files under `dir` (relative paths, sorted), hidden temp files included so leftovers show. */
export function listTree(dir: string, base = dir): string[] {
  const out: string[] = [];
  for (const n of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, n.name);
    if (n.isDirectory()) out.push(...listTree(p, base));
    else out.push(p.slice(base.length + 1));
  }
  return out.sort();
}

/** Result JSON without the field that legitimately differs between runs (diagnostics: timings). */
export function stableJson(path: string): unknown {
  const o = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  delete o.diagnostics; // wall-clock timings (diagnostics.timingsMs)
  return o;
}

/** Compares two output folders: same files; JSON equal modulo timings; everything else byte-equal. */
export function folderDiff(a: string, b: string, skip: (rel: string) => boolean = () => false): string[] {
  const la = listTree(a).filter((f) => !skip(f));
  const lb = listTree(b).filter((f) => !skip(f));
  const diffs: string[] = [];
  if (JSON.stringify(la) !== JSON.stringify(lb)) diffs.push(`file lists differ:\n${la.join(' ')}\n${lb.join(' ')}`);
  for (const f of la.filter((x) => lb.includes(x))) {
    if (f.startsWith('results/') && f.endsWith('.json')) {
      if (JSON.stringify(stableJson(join(a, f))) !== JSON.stringify(stableJson(join(b, f)))) diffs.push(`${f} differs`);
    } else if (!readFileSync(join(a, f)).equals(readFileSync(join(b, f)))) diffs.push(`${f} differs`);
  }
  return diffs;
}

export const MATERIAL_SHEET = JSON.stringify({
  schema: 'fractozone.materials/1',
  materials: [
    {
      name: 'QV-3 (invented alloy)',
      invented: true,
      fractureToughness: { value: 40, unit: 'MPa*sqrt(m)', source: 'invented for the tests' },
      inherentStrength: { value: 1200, unit: 'MPa', source: 'invented for the tests' },
    },
  ],
});
