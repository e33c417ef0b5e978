/**
 * `fractozone measure` on the built CLI (run `npm run build` first; `npm test` does): the result
 * JSON carries the fields the issue names, files are written with --out, a corrected boundary fed
 * back with --boundary is measured without re-segmenting and gives the same numbers as the core's
 * remeasure(), and bad input gives a one-line error with the documented exit code.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { renderFractograph } from '../../src/core/render/index.js';
import { encodeGrayRaster } from '../../src/core/encode/index.js';
import { remeasure, type MeasureResult } from '../../src/core/pipeline/index.js';

const CLI = new URL('../../dist/cli/main.js', import.meta.url).pathname;
const run = (args: string[]) => spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });

let dir: string;
let img: string;
let truthMeanUm: number;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fz-measure-'));
  const { raster, truth } = renderFractograph({ seed: 41, widthPx: 900, heightPx: 700, umPerPx: 9, scaleBar: { lengthUm: 1000, corner: 'br' } });
  img = join(dir, 'rendered.png');
  writeFileSync(img, encodeGrayRaster(raster, { format: 'png' }));
  truthMeanUm = truth.band.meanWidthUm as number;
});

describe('fractozone measure', () => {
  it('prints the result JSON with the documented fields and writes result + overlay with --out', () => {
    const out = join(dir, 'out');
    const r = run(['measure', img, '--bar-length', '1mm', '--json', '--out', out, '--bootstrap', '200']);
    expect(r.status, r.stderr).toBe(0);
    const res = JSON.parse(r.stdout) as MeasureResult;
    expect(res.schema).toBe('fractozone.result/2');
    expect(Object.keys(res).slice(0, 4)).toEqual(['schema', 'tool', 'input', 'quality']);
    expect(['ok', 'check', 'unreliable']).toContain(res.quality.verdict);
    for (const w of [...res.warnings, ...res.quality.reasons]) expect(w.code).toMatch(/^[A-Z][A-Z0-9_]+$/);
    expect(res.scale.source).toBe('scale-bar');
    expect(res.scale.umPerPx).toBeCloseTo(9, 1);
    expect(res.input.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(res.tool.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(res.params.scale.barLengthUm).toBe(1000);
    expect(res.band.detected).toBe(true);
    const w = res.band.widthUm!;
    for (const k of ['n', 'mean', 'median', 'sd', 'min', 'max', 'p05', 'p95'] as const) expect(Number.isFinite(w[k])).toBe(true);
    expect(w.ci95[0]).toBeLessThan(w.mean);
    expect(w.ci95[1]).toBeGreaterThan(w.mean);
    expect(res.band.profile).toHaveLength(360);
    expect(res.band.profile[90]).toMatchObject({ angleDeg: 90 });
    expect(Math.abs(w.mean - truthMeanUm) / truthMeanUm).toBeLessThan(0.04);
    expect(typeof res.band.separability?.fisher).toBe('number');
    expect(res.caution).toMatch(/qualified engineer/);
    expect(existsSync(join(out, 'rendered.result.json'))).toBe(true);
    const png = readFileSync(join(out, 'rendered.overlay.png'));
    expect([...png.subarray(1, 4)].map((c) => String.fromCharCode(c)).join('')).toBe('PNG');
    expect(JSON.parse(readFileSync(join(out, 'rendered.result.json'), 'utf8')).band.widthUm.mean).toBe(w.mean);
  });

  it('--boundary re-measures a corrected boundary and agrees with the core remeasure()', () => {
    const auto = JSON.parse(run(['measure', img, '--pixel-size', '9um', '--json', '--bootstrap', '100']).stdout) as MeasureResult;
    // a corrected boundary: every point moved 4 px towards the centre (band 4 px = 36 µm wider)
    const c = auto.specimen.center;
    const moved = auto.band.boundary!.polygon.map((q) => {
      const dx = q.x - c.x;
      const dy = q.y - c.y;
      const d = Math.hypot(dx, dy);
      return { x: q.x - (4 * dx) / d, y: q.y - (4 * dy) / d };
    });
    const file = join(dir, 'boundary.json');
    writeFileSync(file, JSON.stringify(moved));
    const r = run(['measure', img, '--pixel-size', '9um', '--json', '--bootstrap', '100', '--boundary', file]);
    expect(r.status, r.stderr).toBe(0);
    const manual = JSON.parse(r.stdout) as MeasureResult;
    expect(manual.resolved.boundarySource).toBe('manual');
    expect(manual.band.widthUm!.mean - auto.band.widthUm!.mean).toBeGreaterThan(30);
    expect(manual.band.widthUm!.mean - auto.band.widthUm!.mean).toBeLessThan(42);
    const re = remeasure(auto, { boundaryPolygon: moved });
    expect(re.band.widthUm).toEqual(manual.band.widthUm);
    expect(re.band.profile).toEqual(manual.band.profile);
    expect(re.quality).toEqual(manual.quality);
    // a result file of the former schema (fractozone.result/1, warnings as plain strings) is still
    // accepted as a boundary: only its polygon is read
    const old = join(dir, 'old.result.json');
    writeFileSync(old, JSON.stringify({ schema: 'fractozone.result/1', warnings: ['a plain-text warning'], band: { boundary: { source: 'manual', polygon: moved } } }));
    const fromOld = run(['measure', img, '--pixel-size', '9um', '--json', '--bootstrap', '100', '--boundary', old]);
    expect(fromOld.status, fromOld.stderr).toBe(0);
    expect((JSON.parse(fromOld.stdout) as MeasureResult).band.widthUm).toEqual(manual.band.widthUm);
  });

  it('the text summary gives the quality verdict first, with its reasons and their codes', () => {
    // 200° of 360° excluded: 44 % of the rays give a width → FEW_VALID_RAYS (check)
    const r = run(['measure', img, '--pixel-size', '9um', '--bootstrap', '100', '--exclude', '0-200']);
    expect(r.status, r.stderr).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toMatch(/^rendered\.png {2}\(png, 900×700 px, 8-bit\)$/);
    expect(lines[1]).toMatch(/^ {2}quality {8}CHECK: look at the image and the overlay/);
    expect(lines.slice(2).find((l) => l.includes('[FEW_VALID_RAYS]'))).toMatch(/^ {17}- only \d+ of 360 rays gave a width/);
  });

  it('adds the critical-distance comparison with a material sheet and strain rate', () => {
    const r = run(['measure', img, '--pixel-size', '9um', '--json', '--bootstrap', '100', '--material', 'samples/materials.json:FZ-7 (invented alloy)', '--strain-rate', '1e-3']);
    expect(r.status, r.stderr).toBe(0);
    const res = JSON.parse(r.stdout) as MeasureResult;
    // L(1e-3 1/s) of the invented sheet equals the static L = (1/π)(48/1150)² m (Taylor 2007) ≈ 554.5 µm
    expect(res.criticalDistance!.L_um).toBeCloseTo((1e6 / Math.PI) * (48 / 1150) ** 2, 0);
    expect(res.comparison!.reference).toBe('L');
    expect(res.comparison!.ratio).toBeCloseTo(res.band.widthUm!.mean / res.criticalDistance!.L_um, 6);
    expect(['agrees', 'band-wider', 'band-narrower', 'inconclusive']).toContain(res.comparison!.verdict);
  });

  it.each([
    [['/nonexistent.png', '--pixel-size', '4um'], 1, 'EMPTY_INPUT'],
    [['package.json', '--pixel-size', '4um'], 1, 'NOT_AN_IMAGE'],
    [['IMG', '--pixel-size', '4'], 2, 'BAD_PARAMETER'],
    [['IMG'], 2, 'BAD_SCALE'],
    [['IMG', '--pixel-size', '9um', '--exclude', '10-abc'], 2, 'BAD_PARAMETER'],
    [['IMG', '--pixel-size', '9um', '--boundary', 'package.json'], 2, 'BAD_BOUNDARY'],
    [['IMG', '--pixel-size', '9um', '--features', 'localStd,roughness'], 2, 'BAD_PARAMETER'],
  ])('bad input %j → exit %i, one line [%s]', (args, code, errCode) => {
    const r = run(['measure', ...args.map((a) => (a === 'IMG' ? img : a)), '--json']);
    expect(r.status).toBe(code);
    expect(r.stdout).toBe('');
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toContain(`[${errCode}]`);
  });
});
