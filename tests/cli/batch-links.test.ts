/**
 * Folder walking with symbolic links: links are followed, each folder entered once (device +
 * inode), each file listed once under its shortest path — a link cycle cannot multiply files.
 */
import { mkdirSync, readFileSync, symlinkSync, linkSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { discoverImages } from '../../src/cli/batch/discover.js';
import { discPng, requireBuild, runCli, tempDir, write } from './batch-helpers.js';

/** root/{a.png, loop -> ., sub/{b.png, up -> .., deeper/c.png}, alias -> sub, far/x/y -> ../../sub/deeper} */
function tree(): string {
  const root = join(tempDir('links'), 'root');
  write(join(root, 'a.png'), discPng(32, 1));
  write(join(root, 'sub', 'b.png'), discPng(32, 2));
  write(join(root, 'sub', 'deeper', 'c.png'), discPng(32, 3));
  symlinkSync('.', join(root, 'loop'));
  symlinkSync('..', join(root, 'sub', 'up'));
  symlinkSync('sub', join(root, 'alias'));
  mkdirSync(join(root, 'far', 'x'), { recursive: true });
  symlinkSync('../../sub/deeper', join(root, 'far', 'x', 'y'));
  symlinkSync('missing-target', join(root, 'dangling'));
  return root;
}

describe('discovery with symbolic links', () => {
  it('a link cycle and two links to one folder give each file once, under its shortest real path', () => {
    const root = tree();
    const found = discoverImages([root]).map((i) => i.rel);
    expect(found).toEqual(['a.png', 'sub/b.png', 'sub/deeper/c.png']);
  });

  it('a folder reached only through a link is walked (links are followed)', () => {
    const base = tempDir('links-follow');
    write(join(base, 'data', 'img.png'), discPng(32, 4));
    mkdirSync(join(base, 'view'));
    symlinkSync('../data', join(base, 'view', 'data'));
    expect(discoverImages([join(base, 'view')]).map((i) => i.rel)).toEqual(['data/img.png']);
  });

  it('the shortest path wins even when the link sorts first; a hard link is one file', () => {
    const base = tempDir('links-short');
    write(join(base, 'z', 'deep', 'deeper', 'f.png'), discPng(32, 5));
    symlinkSync('z/deep/deeper', join(base, 'a'));
    linkSync(join(base, 'z', 'deep', 'deeper', 'f.png'), join(base, 'z', 'hard.png'));
    // a/f.png (2 parts) and z/hard.png (2 parts) tie on length: the path without a link wins
    expect(discoverImages([base]).map((i) => i.rel)).toEqual(['z/hard.png']);
  });

  it('glob patterns use the same walk', () => {
    const root = tree();
    expect(discoverImages([`${root}/**/*.png`]).map((i) => i.rel)).toEqual(['a.png', 'sub/b.png', 'sub/deeper/c.png']);
  });
});

describe('batch over a folder with a link cycle', () => {
  beforeAll(requireBuild);
  it('each image has one row, under its top-level path', () => {
    const root = tree();
    const out = join(tempDir('links-out'), 'out');
    const r = runCli(['batch', root, '--out', out, '--pixel-size', '2um', '--jobs', '1', '--no-progress']);
    expect(r.code).toBe(0);
    const rows = Papa.parse<Record<string, string>>(readFileSync(join(out, 'results.csv'), 'utf8'), { header: true, skipEmptyLines: true }).data;
    expect(rows.map((x) => x.file)).toEqual(['a.png', 'sub/b.png', 'sub/deeper/c.png']);
  });
});
