import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { discoverImages, globToRegExp } from '../../src/cli/batch/discover.js';
import { readManifest, readSidecar, mergeSettings } from '../../src/cli/batch/manifest.js';
import { assignSafeNames, sanitiseStem } from '../../src/cli/batch/names.js';
import { inShard, parseShard } from '../../src/cli/batch/shard.js';
import { thumbnailPng } from '../../src/cli/batch/thumb.js';
import { decode } from 'fast-png';
import { discPng, tempDir, write } from './batch-helpers.js';

describe('batch building blocks', () => {
  it('glob: * within a segment, ? one character, ** any depth', () => {
    const re = globToRegExp('**/img?.png');
    expect(re.test('img1.png')).toBe(true);
    expect(re.test('a/b/img2.png')).toBe(true);
    expect(re.test('a/img10.png')).toBe(false);
    expect(globToRegExp('*.tif').test('sub/x.tif')).toBe(false);
    expect(globToRegExp('a.b(1)*').test('a.b(1)x')).toBe(true); // regex characters are literal
  });

  it('safe names: no separators or control characters, bounded, unique and deterministic', () => {
    expect(sanitiseStem('sub/dir\\x y\u0007.png')).toBe('sub__dir__x_y_.png');
    expect(sanitiseStem('../.hidden.png')).toBe('___.hidden.png'); // leading dots become one _
    const inputs = [
      { abs: '/a/Img.png', rel: 'Img.png', root: 0 },
      { abs: '/b/img.png', rel: 'img.png', root: 1 },
      { abs: '/c/long', rel: `${'x'.repeat(300)}.png`, root: 0 },
    ];
    const names = assignSafeNames(inputs);
    expect(new Set(names.map((n) => n.toLowerCase())).size).toBe(3);
    for (const n of names) {
      expect(n.length).toBeLessThanOrEqual(96);
      expect(n).toMatch(/^[A-Za-z0-9._-]+$/);
    }
    expect(assignSafeNames(inputs)).toEqual(names);
  });

  it('discovery is recursive, case-insensitive on extensions, sorted, and skips the output folder', () => {
    const d = tempDir('disc');
    for (const f of ['b.PNG', 'a/z.jpeg', 'a/y.TIFF', 'c.txt', 'out/results/x.png', '.hidden/q.png']) write(join(d, f), 'x');
    expect(discoverImages([d], [join(d, 'out')]).map((i) => i.rel)).toEqual(['a/y.TIFF', 'a/z.jpeg', 'b.PNG']);
  });

  it('shards split k mod n and cover every image exactly once', () => {
    const s = [parseShard('1/3'), parseShard('2/3'), parseShard('3/3')];
    for (let k = 0; k < 10; k++) expect(s.filter((x) => inShard(k, x)).length).toBe(1);
    expect(inShard(4, s[1])).toBe(true);
    expect(() => parseShard('0/2')).toThrow(/1..2/);
    expect(() => parseShard('a')).toThrow(/1\/8/);
  });

  it('manifest: values, metadata, relative material sheet, and errors naming line and column', () => {
    const d = tempDir('man-u');
    write(join(d, 'm.csv'), 'file,notch,pixel_size_um,material,extra\nx/a.png,U,2.5,mats.json:QV,"1,2"\n');
    const m = readManifest(join(d, 'm.csv'));
    const s = m.rows.get(join(d, 'x/a.png'))!;
    expect(s).toMatchObject({ pixelSizeUm: 2.5, material: `${join(d, 'mats.json')}:QV`, metadata: { notch: 'U', extra: '1,2' } });
    write(join(d, 'bad.csv'), 'file,pixel_size_um\na.png,-1\n');
    expect(() => readManifest(join(d, 'bad.csv'))).toThrow('bad.csv line 2, column pixel_size_um: -1 must be greater than 0');
    write(join(d, 'nofile.csv'), 'name,notch\n');
    expect(() => readManifest(join(d, 'nofile.csv'))).toThrow(/no "file" column/);
  });

  it('sidecar JSON is read and the manifest row wins over it', () => {
    const d = tempDir('side');
    write(join(d, 'a.png'), 'x');
    write(join(d, 'a.json'), JSON.stringify({ notch: 'V', strain_rate_per_s: 5, specimen_id: 'S' }));
    const side = readSidecar(join(d, 'a.png'))!;
    expect(side).toMatchObject({ strainRatePerS: 5, metadata: { notch: 'V', specimen_id: 'S' } });
    const merged = mergeSettings(side, { metadata: { notch: 'U' }, strainRatePerS: 7, source: 'm.csv line 2' });
    expect(merged).toMatchObject({ strainRatePerS: 7, metadata: { notch: 'U', specimen_id: 'S' } });
    write(join(d, 'b.png'), 'x');
    write(join(d, 'b.png.json'), '[1]');
    expect(() => readSidecar(join(d, 'b.png'))).toThrow(/JSON object/);
  });

  it('thumbnails are at most 320 px wide and keep the aspect ratio', () => {
    const t = decode(thumbnailPng(discPng(700, 1))!);
    expect(t.width).toBe(320);
    expect(t.height).toBe(320);
    const small = decode(thumbnailPng(discPng(50, 1))!);
    expect(small.width).toBe(50); // never upscaled
  });
});
