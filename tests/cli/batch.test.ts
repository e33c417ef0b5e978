import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { MATERIAL_SHEET, discPng, listTree, requireBuild, runCli, tempDir, uniformPng, write } from './batch-helpers.js';

type Row = Record<string, string>;

function makeSeries(dir: string): void {
  write(join(dir, 'a.png'), discPng(48, 1));
  write(join(dir, 'sub_a/img1.png'), discPng(48, 2));
  write(join(dir, 'sub_b/img1.png'), discPng(48, 3));
  write(join(dir, 'sub_b/IMG2.PNG'), discPng(40, 5)); // upper-case extension is found
  write(join(dir, 'norim.png'), uniformPng(40)); // no rim: a successful "no-band"
  write(join(dir, 'corrupt.png'), discPng(48, 4).slice(0, 120)); // truncated PNG
  write(join(dir, 'notanimage.jpg'), 'this is text, not a picture\n');
  write(join(dir, 'notes.txt'), 'not an image extension: ignored\n');
  write(join(dir, 'sidecar.png'), discPng(40, 6));
  write(join(dir, 'sidecar.png.json'), JSON.stringify({ specimen_id: 'S9', notch: 'V', strain_rate_per_s: 10, pixel_size_um: 2 }));
  write(join(dir, 'materials.json'), MATERIAL_SHEET);
  write(
    join(dir, 'manifest.csv'),
    [
      'file,specimen_id,notch,notch_root_radius_mm,strain_rate_per_s,pixel_size_um,bar_length_um,material,operator',
      'a.png,S1,U,0.5,0.001,4,,materials.json:QV-3 (invented alloy),"Doe, J."',
      'sub_a/img1.png,S2,U,0.5,100,4,,materials.json:QV-3 (invented alloy),"says ""hi"""',
      'sub_b/img1.png,S3,V,0.1,1,5,,materials.json:QV-3 (invented alloy),x',
      'norim.png,S4,V,0.1,1,5,,,',
    ].join('\n') + '\n',
  );
}

describe('fractozone batch (test processor)', () => {
  let inDir: string;
  let out: string;
  let run: ReturnType<typeof runCli>;
  beforeAll(() => {
    requireBuild();
    inDir = tempDir('in');
    out = join(tempDir('out'), 'OUT');
    makeSeries(inDir);
    run = runCli(['batch', inDir, '--manifest', join(inDir, 'manifest.csv'), '--out', out, '--jobs', '2', '--json']);
  });

  it('completes with exit 1 because some images failed, and a JSON summary on stdout', () => {
    expect(run.code, run.stderr).toBe(1);
    const s = JSON.parse(run.stdout);
    expect(s).toMatchObject({ total: 8, ok: 5, noBand: 1, failed: 2, skipped: 0 });
    expect(run.stderr).toMatch(/8 images: 5 ok, 1 no band, 2 failed/);
  });

  it('gives every image the right status and error code', () => {
    const rows = Papa.parse<Row>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true });
    expect(rows.errors).toEqual([]);
    const by = Object.fromEntries(rows.data.map((r) => [r.file, r]));
    expect(Object.keys(by).sort()).toEqual(
      ['a.png', 'corrupt.png', 'norim.png', 'notanimage.jpg', 'sidecar.png', 'sub_a/img1.png', 'sub_b/IMG2.PNG', 'sub_b/img1.png'].sort(),
    );
    expect(by['a.png'].status).toBe('ok');
    expect(by['norim.png'].status).toBe('no-band');
    expect(by['corrupt.png']).toMatchObject({ status: 'error', error_code: 'CORRUPT_IMAGE' });
    expect(by['notanimage.jpg']).toMatchObject({ status: 'error', error_code: 'NOT_AN_IMAGE' });
    expect(by['notanimage.jpg'].error_message).not.toBe('');
  });

  it('applies manifest rows and sidecars (settings, metadata, unknown columns, material)', () => {
    const rows = Papa.parse<Row>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true }).data;
    const by = Object.fromEntries(rows.map((r) => [r.file, r]));
    expect(by['a.png']).toMatchObject({ specimen_id: 'S1', notch: 'U', notch_root_radius_mm: '0.5', strain_rate_per_s: '0.001', um_per_px: '4', meta_operator: 'Doe, J.' });
    expect(by['a.png'].material).toBe('QV-3 (invented alloy)');
    expect(by['sub_a/img1.png'].meta_operator).toBe('says "hi"');
    expect(by['sidecar.png']).toMatchObject({ specimen_id: 'S9', notch: 'V', strain_rate_per_s: '10', um_per_px: '2' });
    expect(by['sub_b/IMG2.PNG']).toMatchObject({ specimen_id: '', strain_rate_per_s: '', um_per_px: '1' });
  });

  it('writes unique sanitised names and one overlay per measured image', () => {
    const results = readdirSync(join(out, 'results')).sort();
    expect(results).toEqual(
      ['a.png.json', 'corrupt.png.json', 'norim.png.json', 'notanimage.jpg.json', 'sidecar.png.json', 'sub_a__img1.png.json', 'sub_b__IMG2.PNG.json', 'sub_b__img1.png.json'].sort(),
    );
    const overlays = readdirSync(join(out, 'overlays')).sort();
    expect(overlays).toEqual(['a.png.png', 'norim.png.png', 'sidecar.png.png', 'sub_a__img1.png.png', 'sub_b__IMG2.PNG.png', 'sub_b__img1.png.png']);
    // no temporary files left behind, nothing but the documented files
    expect(listTree(out).filter((f) => f.includes('.tmp'))).toEqual([]);
    expect(existsSync(join(out, 'report.html'))).toBe(true);
  });

  it('CSV (parsed by papaparse) and JSON Lines agree with the per-image JSON files', () => {
    const csv = Papa.parse<Row>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true }).data;
    const jsonl = readFileSync(join(out, 'results.jsonl'), 'utf8')
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(jsonl.length).toBe(csv.length);
    for (const [i, row] of csv.entries()) {
      const j = jsonl[i];
      for (const [k, v] of Object.entries(row)) expect(v, `${row.file} ${k}`).toBe(j[k] === null ? '' : String(j[k]));
      const safe = row.file.replace(/\//g, '__');
      const rec = JSON.parse(readFileSync(join(out, 'results', `${safe}.json`), 'utf8'));
      expect(row.sha256).toBe(rec.batch.sha256);
      expect(row.status).toBe(rec.batch.status);
      if (row.status === 'ok') {
        expect(Number(row.width_mean_um)).toBe(rec.band.widthUm.mean);
        expect(Number(row.width_median_um)).toBe(rec.band.widthUm.median);
        expect(Number(row.width_sd_um)).toBe(rec.band.widthUm.sd);
        expect(Number(row.width_ci95_lo_um)).toBe(rec.band.widthUm.ci95[0]);
        expect(Number(row.width_ci95_hi_um)).toBe(rec.band.widthUm.ci95[1]);
        expect(Number(row.radius_um)).toBe(rec.specimen.radiusUm);
        expect(Number(row.um_per_px)).toBe(rec.scale.umPerPx);
      }
      if (row.status === 'error') expect(row.error_code).toBe(rec.error.code);
      if (row.L_um !== '') {
        expect(Number(row.L_um)).toBe(rec.criticalDistance.L_um);
        expect(Number(row.ratio)).toBe(rec.comparison.ratio);
        expect(row.verdict).toBe(rec.comparison.verdict);
      }
    }
  });

  it('uses RFC 4180 CRLF line ends and quotes fields holding commas or quotes', () => {
    const text = readFileSync(join(out, 'results.csv'), 'utf8');
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.split('\r\n').length).toBe(8 + 2); // header + 8 rows + final empty
    expect(text).toContain('"Doe, J."');
    expect(text).toContain('"says ""hi"""');
  });

  it('records the image hash, so a changed image is not mistaken for a done one', async () => {
    const { createHash } = await import('node:crypto');
    const rec = JSON.parse(readFileSync(join(out, 'results', 'a.png.json'), 'utf8'));
    expect(rec.batch.sha256).toBe(createHash('sha256').update(readFileSync(join(inDir, 'a.png'))).digest('hex'));
    expect(rec.input.file).toBe('a.png');
    expect(rec.batch.paramsSha256).toMatch(/^[0-9a-f]{64}$/);
  });
});

describe('fractozone batch: refusals and crashes', () => {
  beforeAll(() => requireBuild());

  it('names the manifest line and column of a bad value (exit 2)', () => {
    const d = tempDir('man');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'manifest.csv'), 'file,strain_rate_per_s\na.png,1\n"b.png",2\n\nc.png,fast\n');
    const r = runCli(['batch', d, '--manifest', join(d, 'manifest.csv'), '--out', join(d, 'out')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('manifest.csv line 5, column strain_rate_per_s: "fast" is not a number');
    expect(existsSync(join(d, 'out'))).toBe(false);
  });

  it('refuses an output folder equal to, or containing, an input folder', () => {
    const d = tempDir('outchk');
    write(join(d, 'in/a.png'), discPng(32, 1));
    const same = runCli(['batch', join(d, 'in'), '--out', join(d, 'in')]);
    expect(same.code).toBe(2);
    expect(same.stderr).toMatch(/is an input folder/);
    const parent = runCli(['batch', join(d, 'in'), '--out', d]);
    expect(parent.code).toBe(2);
    expect(parent.stderr).toMatch(/inside the output folder/);
  });

  it('accepts an output folder inside the input folder and does not read its own outputs back', () => {
    const d = tempDir('nested');
    write(join(d, 'a.png'), discPng(32, 1));
    const first = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '1', '--json']);
    expect(first.code, first.stderr).toBe(0);
    const again = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '1', '--json']);
    expect(JSON.parse(again.stdout).total).toBe(1);
  });

  it('accepts glob patterns (* ? **) and reports no-match as a usage error', () => {
    const d = tempDir('glob');
    write(join(d, 'x/one.png'), discPng(32, 1));
    write(join(d, 'x/deep/two.png'), discPng(32, 2));
    write(join(d, 'x/three.tif'), 'tif?');
    const r = runCli(['batch', `${d}/x/**/*.png`, '--out', join(d, 'out'), '--jobs', '1', '--json']);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(join(d, 'out/results')).sort()).toEqual(['deep__two.png.json', 'one.png.json']);
    const none = runCli(['batch', `${d}/x/*.jpg`, '--out', join(d, 'out2')]);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/no images found/);
  });

  it('a worker crash fails that image only; the pool replaces the worker and the batch goes on', () => {
    const d = tempDir('crash');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'crash.png'), discPng(32, 2));
    write(join(d, 'z.png'), discPng(32, 3));
    write(join(d, 'zz.png'), discPng(32, 4));
    const r = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '1', '--json']);
    expect(r.code).toBe(1);
    const s = JSON.parse(r.stdout);
    expect(s).toMatchObject({ total: 4, ok: 3, failed: 1, workersReplaced: 1 });
    const rec = JSON.parse(readFileSync(join(d, 'out/results/crash.png.json'), 'utf8'));
    expect(rec.error.code).toBe('PROCESSING_FAILED');
    expect(rec.error.message).toMatch(/worker stopped/);
    expect(rec.error.message).toMatch(/simulated worker crash/); // the worker's own last error line
  });

  it('a worker over --worker-memory fails that image with the heap message; the batch goes on', () => {
    const d = tempDir('oom');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'oom.png'), discPng(32, 2));
    write(join(d, 'z.png'), discPng(32, 3));
    const r = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '1', '--json', '--worker-memory', '48']);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout)).toMatchObject({ total: 3, ok: 2, failed: 1, workersReplaced: 1 });
    const rec = JSON.parse(readFileSync(join(d, 'out/results/oom.png.json'), 'utf8'));
    expect(rec.error.code).toBe('PROCESSING_FAILED');
    expect(rec.error.message).toMatch(/worker stopped/);
    expect(rec.error.message).toMatch(/FATAL ERROR: .*heap out of memory/);
    expect(r.stderr).not.toMatch(/\n\s+at /); // V8's report stays out of the batch's own output
  });

  it('--image-timeout stops a hanging image (IMAGE_TIMEOUT) and the batch goes on', () => {
    const d = tempDir('hang');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'hang.png'), discPng(32, 2));
    write(join(d, 'z.png'), discPng(32, 3));
    const t0 = Date.now();
    const r = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '2', '--json', '--image-timeout', '2']);
    expect(Date.now() - t0).toBeLessThan(60_000);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout)).toMatchObject({ total: 3, ok: 2, failed: 1, workersReplaced: 1 });
    const rec = JSON.parse(readFileSync(join(d, 'out/results/hang.png.json'), 'utf8'));
    expect(rec.error.code).toBe('IMAGE_TIMEOUT');
    expect(rec.error.message).toMatch(/--image-timeout 2 s/);
    expect(runCli(['batch', d, '--out', join(d, 'out2'), '--image-timeout', '0']).code).toBe(2);
  });

  it('a processor that cannot load stops the batch with a clear one-line error (exit 1)', () => {
    const d = tempDir('noproc');
    write(join(d, 'a.png'), discPng(32, 1));
    const r = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '1'], { FRACTOZONE_BATCH_PROCESSOR: join(d, 'missing-module.mjs') });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/fractozone: error \[PROCESSING_FAILED\]: a batch worker could not start/);
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });

  it('exits 0 when every image succeeds (no-band counts as success)', () => {
    const d = tempDir('allok');
    write(join(d, 'a.png'), discPng(32, 1));
    write(join(d, 'b.png'), uniformPng(32));
    const r = runCli(['batch', d, '--out', join(d, 'out'), '--jobs', '2']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toBe('');
  });
});
