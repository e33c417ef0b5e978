/** `fractozone info` through the built CLI (npm run build, then node dist/cli/main.js). */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { crc32 } from 'node:zlib';
import { join } from 'node:path';
import { encode } from 'fast-png';
import { beforeAll, describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const CLI = join(ROOT, 'dist', 'cli', 'main.js');
let dir = '';
let good = '';
let meta = '';
let corrupt = '';

function run(...args: string[]) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** Insert a pHYs chunk (unit 1 = metre) right after IHDR (PNG spec 11.3.5.3; chunk CRC over type + data). */
function withPhys(png: Uint8Array, xPerM: number, yPerM: number): Uint8Array {
  const chunk = new Uint8Array(4 + 4 + 9 + 4);
  const dv = new DataView(chunk.buffer);
  dv.setUint32(0, 9);
  chunk.set([0x70, 0x48, 0x59, 0x73], 4); // "pHYs"
  dv.setUint32(8, xPerM);
  dv.setUint32(12, yPerM);
  chunk[16] = 1;
  dv.setUint32(17, crc32(chunk.subarray(4, 17)));
  const at = 8 + 25; // signature + IHDR chunk
  const out = new Uint8Array(png.length + chunk.length);
  out.set(png.subarray(0, at), 0);
  out.set(chunk, at);
  out.set(png.subarray(at), at + chunk.length);
  return out;
}

beforeAll(() => {
  try {
    execFileSync('npm', ['run', 'build'], { cwd: ROOT, stdio: 'pipe' });
  } catch (e) {
    // tsc still emits when files owned by others have type errors; go on if the CLI was written
    if (!existsSync(join(ROOT, 'dist', 'cli', 'commands', 'info.js'))) throw e;
  }
  dir = mkdtempSync(join(tmpdir(), 'fz-info-'));
  const W = 640;
  const H = 480;
  const d = new Uint8Array(W * H).fill(20);
  // light bar, columns 400..559 (160 px), rows 430..434
  for (let y = 430; y < 435; y++) for (let x = 400; x < 560; x++) d[y * W + x] = 245;
  good = join(dir, 'bar.png');
  writeFileSync(good, encode({ width: W, height: H, data: d, channels: 1, depth: 8 }));
  // pHYs 400000 px/m = 2.5 µm/px (PNG spec 11.3.5.3: pixels per metre)
  meta = join(dir, 'meta.png');
  writeFileSync(meta, withPhys(encode({ width: W, height: H, data: d, channels: 1, depth: 8 }), 400000, 400000));
  corrupt = join(dir, 'corrupt.png');
  writeFileSync(corrupt, Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 1, 2, 3]));
}, 120_000);

describe('fractozone info', () => {
  it('--json gives the documented shape; bar length gives µm/px', () => {
    const r = run('info', good, '--json', '--bar-length', '500um');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    expect(j).toMatchObject({ format: 'png', widthPx: 640, heightPx: 480, bitDepth: 8, channels: 1, metadataScale: null });
    expect(j.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(j.toolVersion).toBeTypeOf('string');
    expect(j.scaleBar).not.toBeNull();
    expect(Math.abs(j.scaleBar.lengthPx - 160)).toBeLessThanOrEqual(0.5);
    for (const k of ['x0', 'y0', 'x1', 'y1', 'confidence']) expect(j.scaleBar[k]).toBeTypeOf('number');
    expect(j.scaleBar.umPerPx).toBeCloseTo(500 / j.scaleBar.lengthPx, 9);
    expect(Math.abs(j.scaleBar.umPerPx - 3.125)).toBeLessThan(0.01); // 500 µm / 160 px
  });
  it('reports the metadata pixel size', () => {
    const j = JSON.parse(run('info', meta, '--json').out);
    expect(j.metadataScale.source).toBe('png-phys');
    expect(j.metadataScale.umPerPxX).toBeCloseTo(2.5, 9);
  });
  it('text output carries units', () => {
    const r = run('info', good, '--bar-length', '0.5mm');
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/640 × 480 px/);
    expect(r.out).toMatch(/µm\/px/);
  });
  it('several images → one JSON array', () => {
    const r = run('info', good, meta, '--json');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    expect(Array.isArray(j)).toBe(true);
    expect(j).toHaveLength(2);
  });
  it('corrupt file → exit 1 and one line on stderr', () => {
    const r = run('info', corrupt);
    expect(r.code, r.err).toBe(1);
    expect(r.out).toBe('');
    const lines = r.err.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^fractozone: error \[[A-Z_]+\]: /);
  });
  it('a corrupt file among several → its error in the array, exit 1, JSON still parses', () => {
    const r = run('info', good, corrupt, '--json');
    expect(r.code, r.err).toBe(1);
    expect(r.out, r.err).not.toBe('');
    const j = JSON.parse(r.out);
    expect(j[1].error.code).toMatch(/[A-Z_]+/);
  });
  it('bad --bar-length / --max-pixels → exit 2', () => {
    const r = run('info', good, '--bar-length', 'abc');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--bar-length/);
    expect(run('info', good, '--max-pixels', '-3').code).toBe(2);
  });
  it('--max-pixels refuses a larger image', () => {
    const r = run('info', good, '--max-pixels', '1000');
    expect(r.code, r.err).toBe(1);
    expect(r.err).toMatch(/IMAGE_TOO_LARGE/);
  });
  it('--help', () => {
    const r = run('info', '--help');
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/--bar-length/);
    expect(r.out).toMatch(/--json/);
  });
});
