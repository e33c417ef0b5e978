/** `fractozone render` and the sample script, run as the built CLI (needs `npm run build`). */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { decode as decodePng } from 'fast-png';
import * as UTIF from 'utif2';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const CLI = join(ROOT, 'dist/cli/main.js');

function run(args: string[]): { code: number | null; stdout: string; stderr: string } {
  if (!existsSync(CLI)) throw new Error('the CLI is not built: run `npm run build` first');
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', cwd: ROOT });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
const sha = (p: string): string => createHash('sha256').update(readFileSync(p)).digest('hex');

describe('fractozone render', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fz-render-'));

  it('writes a 16-bit PNG with pHYs and its truth; --json prints only JSON', () => {
    const out = join(dir, 'a.png');
    const r = run(['render', '--out', out, '--size', '320x240', '--pixel-size', '25um', '--bar', '1mm', '--bit-depth', '16', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.widthPx).toBe(320);
    expect(j.bitDepth).toBe(16);
    expect(j.scaleBarLengthPx).toBe(40);
    const png = decodePng(readFileSync(out));
    expect(png.depth).toBe(16);
    expect(png.resolution).toEqual({ x: 40000, y: 40000, unit: 1 }); // 25 µm/px → 40000 px/m
    const truth = JSON.parse(readFileSync(join(dir, 'a.truth.json'), 'utf8'));
    expect(truth.schema).toBe('fractozone.truth/1');
    expect(truth.umPerPxX).toBe(25);
    expect(j.sha256).toBe(sha(out));
  });

  it('is reproducible: same options → same bytes; TIFF is 16-bit by default', () => {
    const a = join(dir, 'b1.tif');
    const b = join(dir, 'b2.tif');
    const args = ['--size', '200x160', '--pixel-size', '40um', '--seed', '5', '--tilt', '20', '--no-bar'];
    expect(run(['render', '--out', a, ...args]).code).toBe(0);
    expect(run(['render', '--out', b, ...args]).code).toBe(0);
    expect(sha(a)).toBe(sha(b));
    const bytes = readFileSync(a);
    const ifd = UTIF.decode(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer)[0];
    expect((ifd.t258 as number[])[0]).toBe(16);
    const truth = JSON.parse(readFileSync(join(dir, 'b1.truth.json'), 'utf8'));
    expect(truth.outline.kind).toBe('ellipse');
    expect(truth.scaleBar).toBeNull();
  });

  it('writes JPEG and honours --no-rim and --equal-brightness', () => {
    const out = join(dir, 'c.jpg');
    const r = run(['render', '--out', out, '--size', '200x160', '--pixel-size', '40um', '--no-rim', '--equal-brightness', '--bar', '2mm']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/band: none/);
    const b = readFileSync(out);
    expect([b[0], b[1]]).toEqual([0xff, 0xd8]);
    expect(JSON.parse(readFileSync(join(dir, 'c.truth.json'), 'utf8')).band.present).toBe(false);
  });

  it('bad options → exit 2 with a one-line message', () => {
    const cases: [string[], RegExp][] = [
      [['render', '--out', join(dir, 'x.gif')], /must end in \.png, \.jpg or \.tif/],
      [['render', '--out', join(dir, 'x.png'), '--pixel-size', '4'], /has no unit/],
      [['render', '--out', join(dir, 'x.png'), '--size', 'big'], /--size/],
      [['render', '--out', join(dir, 'x.jpg'), '--bit-depth', '16'], /8-bit only/],
      [['render', '--out', join(dir, 'x.png'), '--tilt', '95'], /tilt/],
      [['render', '--out', join(dir, 'x.png'), '--background', 'grey'], /background/],
      [['render', '--out', join(dir, 'x.png'), '--size', '100x100', '--bar', '10mm'], /does not fit/],
    ];
    for (const [args, msg] of cases) {
      const r = run(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr).toMatch(msg);
      expect(r.stdout).toBe('');
    }
  });

  it('scene-element flags: a colour PNG with a U flank, paper and a shadow; the truth of the fracture surface is unchanged', () => {
    const base = ['--size', '400x300', '--pixel-size', '25um', '--seed', '4', '--no-bar'];
    const plainOut = join(dir, 'e0.png');
    const out = join(dir, 'e1.png');
    expect(run(['render', '--out', plainOut, ...base]).code).toBe(0);
    const r = run(['render', '--out', out, ...base, '--flank', 'U', '--flank-ratio', '1.25', '--background', 'paper', '--shadow', '--colour', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.colour).toBe(true);
    expect(j.sceneElements).toEqual(['flank:U', 'holder:paper', 'shadow', 'colour']);
    const png = decodePng(readFileSync(out));
    expect(png.channels).toBe(3);
    const t = JSON.parse(readFileSync(join(dir, 'e1.truth.json'), 'utf8'));
    const t0 = JSON.parse(readFileSync(join(dir, 'e0.truth.json'), 'utf8'));
    expect(t.band).toEqual(t0.band);
    expect(t.outerRadiusPxByAngle).toEqual(t0.outerRadiusPxByAngle);
    expect(t.scene.flank.barDiameterUm).toBe(6250);
    expect(t0.scene).toBeUndefined();
  });

  it('--scene starts from a named scene (typed options override it); --list-scenes lists the set', () => {
    const list = run(['render', '--list-scenes']);
    expect(list.code).toBe(0);
    expect(list.stdout).toMatch(/^plain +the typical specimen/m);
    expect(list.stdout).toMatch(/^halves-rule +/m);
    const out = join(dir, 'h.png');
    const r = run(['render', '--scene', 'halves', '--out', out, '--seed', '9', '--json']);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).specimens).toBe(2);
    const t = JSON.parse(readFileSync(join(dir, 'h.truth.json'), 'utf8'));
    expect(t.seed).toBe(9);
    expect(t.umPerPxX).toBe(14); // from the scene
    expect(t.sceneSet.name).toBe('halves');
    expect(t.specimens.map((s: { id: string }) => s.id)).toEqual(['A', 'B']);
  });

  it('--scene-set DIR --only writes those scenes with truth files and scenes.json', () => {
    const set = join(dir, 'set');
    const r = run(['render', '--scene-set', set, '--only', 'plain,label', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const index = JSON.parse(readFileSync(join(set, 'scenes.json'), 'utf8'));
    expect(index.schema).toBe('fractozone.scene-set/1');
    expect(index.scenes.map((s: { name: string }) => s.name)).toEqual(['plain', 'label']);
    for (const s of index.scenes) {
      expect(sha(join(set, s.file))).toBe(s.sha256);
      const t = JSON.parse(readFileSync(join(set, s.truth), 'utf8'));
      expect(t.sceneSet.name).toBe(s.name);
      expect(t.band.meanWidthUm).toBe(s.meanWidthUm);
    }
  });

  it('bad scene options → exit 2 with one line', () => {
    const cases: [string[], RegExp][] = [
      [['render', '--out', join(dir, 'x.png'), '--scene', 'nope'], /unknown scene "nope"/],
      [['render', '--out', join(dir, 'x.png'), '--flank', 'W'], /--flank must be V or U/],
      [['render', '--out', join(dir, 'x.png'), '--flank', 'V', '--flank-ratio', '9'], /--flank-ratio must be between/],
      [['render', '--out', join(dir, 'x.png'), '--colour', '--bit-depth', '16'], /8-bit PNG only/],
      [['render', '--out', join(dir, 'x.png'), '--scene-set', join(dir, 'y')], /either --out FILE or --scene-set DIR/],
      [['render', '--scene-set', join(dir, 'y'), '--only', 'nope'], /unknown scene "nope" in --only/],
      [['render', '--size', '100x100'], /--out FILE.png\|.jpg\|.tif is required/],
      [['render', '--out', join(dir, 'x.png'), '--size', '400x300', '--pixel-size', '25um', '--rule', 'top', '--no-bar', '--diameter', '6.5mm'], /steel rule .* would cover the specimen/],
    ];
    for (const [args, msg] of cases) {
      const r = run(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr).toMatch(msg);
      expect(r.stderr.trim().split('\n').length).toBe(1);
      expect(r.stdout).toBe('');
    }
  });

  it('--help lists the options', () => {
    const r = run(['render', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/--band-width/);
    expect(r.stdout).toMatch(/--equal-brightness/);
    for (const flag of ['--scene ', '--scene-set', '--flank ', '--shadow', '--sem-strip', '--glints', '--colour', '--defocus', '--halves', '--rule', '--label']) expect(r.stdout).toContain(flag);
  });
});

describe('samples are reproducible byte for byte', () => {
  it('regenerating fz7-V-r1e3.jpg gives the committed file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'fz-samples-'));
    const r = spawnSync(process.execPath, [join(ROOT, 'scripts/make-samples.mjs'), '--only', 'fz7-V-r1e3.jpg', '--out', dir], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(sha(join(dir, 'fz7-V-r1e3.jpg'))).toBe(sha(join(ROOT, 'samples/fz7-V-r1e3.jpg')));
    expect(sha(join(dir, 'fz7-V-r1e3.truth.json'))).toBe(sha(join(ROOT, 'samples/fz7-V-r1e3.truth.json')));
  });

  it('manifest and materials sheet follow the agreed formats', () => {
    const csv = readFileSync(join(ROOT, 'samples/manifest.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('file,specimen_id,notch,notch_root_radius_mm,strain_rate_per_s,pixel_size_um,bar_length_um,material');
    expect(csv.length).toBe(7);
    for (const row of csv.slice(1)) {
      const f = row.split(',');
      expect(existsSync(join(ROOT, 'samples', f[0]))).toBe(true);
      expect(f[7]).toBe('materials.json:FZ-7 (invented alloy)');
    }
    expect(csv.slice(1).some((r) => r.split(',')[5] === '')).toBe(true);
    const m = JSON.parse(readFileSync(join(ROOT, 'samples/materials.json'), 'utf8'));
    expect(m.schema).toBe('fractozone.materials/1');
    const mat = m.materials[0];
    expect(mat.invented).toBe(true);
    // L = (1/π)(K_c/σ_0)² (Taylor 2007): 48 MPa·√m, 1150 MPa → ≈ 554.6 µm at 1e-3 1/s
    const L = (1 / Math.PI) * (mat.fractureToughness.value / mat.inherentStrength.value) ** 2 * 1e6;
    expect(mat.dynamic.L.A * 1e-3 ** mat.dynamic.L.B).toBeCloseTo(L, 0);
    expect(mat.dynamic.L.A * 1e3 ** mat.dynamic.L.B).toBeCloseTo(277.9, 0);
  });
});
