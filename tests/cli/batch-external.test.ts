/**
 * `fractozone batch` over fractographs made by a generator that is not ours
 * (scripts/fixtures/make_external_fractographs.py: numpy, SciPy, Pillow, tifffile) with broken files
 * mixed in: one correct row per file, the batch completes, exit 1 because some files failed, and
 * each measured mean width is within 4 % of that generator's truth. Needs `npm run build`.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { CLI, ROOT, requireBuild, tempDir } from './batch-helpers.js';

const EXT = join(ROOT, 'tests/fixtures/external');

interface Truth {
  file: string;
  umPerPx: number;
  band: { present: boolean; meanWidthUm: number | null };
  scaleBar: { lengthUm: number };
}

let rows: Record<string, string>[];
let status: number | null;
const truths = new Map<string, Truth>();

beforeAll(() => {
  requireBuild();
  const dir = tempDir('batch-ext');
  const inDir = join(dir, 'in');
  mkdirSync(inDir);
  const lines = ['file,specimen_id,bar_length_um'];
  for (const f of readdirSync(EXT).filter((n) => n.endsWith('.truth.json'))) {
    const t = JSON.parse(readFileSync(join(EXT, f), 'utf8')) as Truth;
    truths.set(t.file, t);
    copyFileSync(join(EXT, t.file), join(inDir, t.file));
    lines.push(`${t.file},EXT-${t.file.split('.')[0]},${t.scaleBar.lengthUm}`);
  }
  // broken files: a JPEG cut in half, a text file with an image name, a zero-byte TIFF
  const jpg = readFileSync(join(EXT, 'round_dark.jpg'));
  writeFileSync(join(inDir, 'cut_in_half.jpg'), jpg.subarray(0, jpg.length >> 1));
  writeFileSync(join(inDir, 'notes.png'), 'not an image\n');
  writeFileSync(join(inDir, 'empty.tif'), new Uint8Array(0));
  writeFileSync(join(inDir, 'manifest.csv'), lines.join('\n') + '\n');
  const out = join(dir, 'out');
  const r = spawnSync(process.execPath, [CLI, 'batch', inDir, '--manifest', join(inDir, 'manifest.csv'), '--out', out, '--jobs', '2', '--no-progress', '--bootstrap', '200'], {
    encoding: 'utf8',
  });
  status = r.status;
  const parsed = Papa.parse<Record<string, string>>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  rows = parsed.data;
}, 240_000);

describe('batch over an outside generator’s fractographs with broken files', () => {
  it('gives one row per file and exit 1 (some files failed)', () => {
    expect(status).toBe(1);
    expect(rows).toHaveLength(truths.size + 3);
  });

  it('broken files become error rows with their error code', () => {
    const by = new Map(rows.map((r) => [r.file, r]));
    expect(by.get('cut_in_half.jpg')).toMatchObject({ status: 'error', error_code: 'TRUNCATED_IMAGE' });
    expect(by.get('notes.png')).toMatchObject({ status: 'error', error_code: 'NOT_AN_IMAGE' });
    expect(by.get('empty.tif')).toMatchObject({ status: 'error', error_code: 'EMPTY_INPUT' });
  });

  it('measured images agree with the outside truth (scale from the detected bar, width within 4 %)', () => {
    for (const [file, t] of truths) {
      const r = rows.find((x) => x.file === file)!;
      if (!t.band.present) {
        expect(r.status, file).toBe('no-band');
        continue;
      }
      expect(r.status, `${file}: ${r.error_message}`).toBe('ok');
      expect(r.scale_source).toBe('scale-bar');
      expect(Math.abs(Number(r.um_per_px) - t.umPerPx) / t.umPerPx).toBeLessThan(0.01);
      // mean over all rays of the truth (every ray of these images is measurable)
      const err = Math.abs(Number(r.width_mean_um) - (t.band.meanWidthUm as number)) / (t.band.meanWidthUm as number);
      expect(err, `${file}: ${r.width_mean_um} µm vs ${t.band.meanWidthUm} µm`).toBeLessThan(0.04);
    }
  });
});
