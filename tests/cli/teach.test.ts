/**
 * `fractozone teach`, `measure --model` and `batch --model` on the built CLI: a model taught from a
 * label image (thin arcs from the truth of a rendered image) is written, reports pixels per class
 * and out-of-bag accuracy, is the same file byte for byte when taught again, and is used by
 * measure and batch (manifest column `model`), each result recording the model's SHA-256. Bad
 * input — a label image of another size, a label value above 3, a class without labelled pixels,
 * a model file of another version or a damaged one — gives one line, exit 2 and writes nothing.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { encodeGrayRaster, encodePng } from '../../src/core/encode/index.js';
import { strokeLabels } from '../../src/core/learn/strokes.js';
import { renderFractograph, type RenderOptions } from '../../src/core/render/index.js';
import type { MeasureResult } from '../../src/core/pipeline/index.js';

const CLI = new URL('../../dist/cli/main.js', import.meta.url).pathname;
const run = (args: string[], cwd?: string) => spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', cwd });

let dir: string;
const W = 600;
const H = 460;
const OPTS: RenderOptions = { widthPx: W, heightPx: H, umPerPx: 14, noiseSigma: 0.01, scaleBar: null, rim: { widthUm: 500, transitionUm: 40 } };

function labelPng(data: Uint8Array, w = W, h = H): Uint8Array {
  return encodePng({ width: w, height: h, data, layout: 'gray8' });
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fz-teach-'));
  for (const k of [0, 1]) {
    const r = renderFractograph({ ...OPTS, seed: 70 + k });
    writeFileSync(join(dir, `img${k}.png`), encodeGrayRaster(r.raster, { format: 'png' }));
    const t = r.truth;
    const lab = strokeLabels({ width: W, height: H, center: t.centre, outerRadiusPx: t.outerRadiusPxByAngle, boundaryRadiusPx: t.boundaryRadiusPxByAngle });
    writeFileSync(join(dir, `img${k}.labels.png`), labelPng(lab.data));
  }
  const lab = new Uint8Array(W * H);
  lab.fill(1, 0, W * 10);
  lab.fill(2, W * 100, W * 100 + 50);
  writeFileSync(join(dir, 'no-core.labels.png'), labelPng(lab));
  const big = new Uint8Array(W * H);
  big[W * 7 + 5] = 7;
  writeFileSync(join(dir, 'seven.labels.png'), labelPng(big));
  writeFileSync(join(dir, 'small.labels.png'), labelPng(new Uint8Array(100 * 80), 100, 80));
});

const sha = (p: string): string => createHash('sha256').update(readFileSync(p)).digest('hex');

describe('fractozone teach / measure --model / batch --model', () => {
  it('teaches a model, prints pixels per class and out-of-bag accuracy, and gives the same bytes again', () => {
    const r = run(['teach', '--image', 'img0.png', '--labels', 'img0.labels.png', '--pixel-size', '14um', '--trees', '16', '--out', 'm.json'], dir);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/trained on\s+outside \d+, rim \d+, core \d+ px/);
    expect(r.stdout).toMatch(/out-of-bag\s+accuracy \d+\.\d %/);
    const m = JSON.parse(readFileSync(join(dir, 'm.json'), 'utf8'));
    expect(m.schema).toBe('fractozone.model/1');
    expect(m.training.images[0].sha256).toBe(sha(join(dir, 'img0.png')));
    expect(m.training.oobAccuracy).toBeGreaterThan(0.9);
    const again = run(['teach', '--image', 'img0.png', '--labels', 'img0.labels.png', '--pixel-size', '14um', '--trees', '16', '--out', 'm2.json'], dir);
    expect(again.status, again.stderr).toBe(0);
    expect(readFileSync(join(dir, 'm2.json'), 'utf8')).toBe(readFileSync(join(dir, 'm.json'), 'utf8'));
  });

  it('measures with the model and records its SHA-256 and confidence', () => {
    const r = run(['measure', 'img1.png', '--pixel-size', '14um', '--model', 'm.json', '--json', '--bootstrap', '0'], dir);
    expect(r.status, r.stderr).toBe(0);
    const res = JSON.parse(r.stdout) as MeasureResult;
    expect(res.model?.sha256).toBe(sha(join(dir, 'm.json')));
    expect(res.params.modelSha256).toBe(res.model?.sha256);
    expect(res.model?.confidence.boundary).toBeGreaterThan(0.5);
    expect(res.band.detected).toBe(true);
  });

  it('runs a batch with a manifest column model', () => {
    writeFileSync(join(dir, 'manifest.csv'), 'file,pixel_size_um,model\nimg1.png,14,m.json\n');
    const r = run(['batch', '--manifest', 'manifest.csv', '--out', 'out', '--jobs', '1', '--no-progress'], dir);
    expect(r.status, r.stderr).toBe(0);
    const res = JSON.parse(readFileSync(join(dir, 'out', 'results', 'img1.png.json'), 'utf8')) as MeasureResult;
    expect(res.model?.sha256).toBe(sha(join(dir, 'm.json')));
    expect(res.params.modelSha256).toBe(res.model?.sha256);
  });

  it.each([
    ['a label image of another size', ['teach', '--image', 'img0.png', '--labels', 'small.labels.png'], /100×80 px but its image is 600×460 px/],
    ['a label value above 3', ['teach', '--image', 'img0.png', '--labels', 'seven.labels.png'], /value 7 at \(x 5, y 7\)/],
    ['a class with no labelled pixels', ['teach', '--image', 'img0.png', '--labels', 'no-core.labels.png'], /no pixel is labelled core \(value 3\)/],
  ])('refuses %s: one line, exit 2, nothing written', (_what, args, message) => {
    const r = run([...args, '--pixel-size', '14um', '--out', 'bad.json'], dir);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^fractozone: error \[BAD_LABELS\]: /);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(existsSync(join(dir, 'bad.json'))).toBe(false);
  });

  it.each([
    ['of another version', (t: string) => t.replace('"fractozone.model/1"', '"fractozone.model/9"'), /of version "fractozone.model\/9"/],
    ['damaged (one digit changed)', (t: string) => t.replace(/"threshold": \[(-?)(\d)/, (_m, s, d) => `"threshold": [${s}${(Number(d) + 1) % 10}`), /damaged: its checksum/],
    ['cut short', (t: string) => t.slice(0, Math.floor(t.length / 2)), /not valid JSON/],
  ])('refuses a model file %s for measure and batch: one line, exit 2, nothing written', (name, damage, message) => {
    const file = `bad-${name.split(' ')[0]}.json`;
    writeFileSync(join(dir, file), damage(readFileSync(join(dir, 'm.json'), 'utf8')));
    for (const args of [
      ['measure', 'img1.png', '--pixel-size', '14um', '--model', file, '--out', 'mout'],
      ['batch', 'img1.png', '--pixel-size', '14um', '--model', file, '--out', 'bout', '--no-progress'],
    ]) {
      const r = run(args, dir);
      expect(r.status, r.stderr).toBe(2);
      expect(r.stderr).toMatch(/^fractozone: error \[BAD_MODEL\]: model file "bad-/);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    expect(existsSync(join(dir, 'mout'))).toBe(false);
    expect(existsSync(join(dir, 'bout'))).toBe(false);
  });
});
