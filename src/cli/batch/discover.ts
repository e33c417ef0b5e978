/**
 * Image discovery for `batch`: folders (recursive, image extensions only), glob patterns
 * (`*`, `?`, `**`; any file that matches), and explicit files. Sorted deterministically by the
 * relative path (code-unit order). Symbolic links are followed, each folder is entered once and
 * each file is listed once (device + inode), under its shortest path.
 */
import { lstatSync, readdirSync, statSync, type BigIntStats } from 'node:fs';
import { join, relative, resolve, sep, basename } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { printable } from '../../core/text/printable.js';

export const IMAGE_EXTENSIONS = ['.png', '.jpg', '.jpeg', '.tif', '.tiff'];

/** One discovered input. */
export interface InputImage {
  /** Absolute path. */
  abs: string;
  /** Path relative to the root it was found under, forward slashes. */
  rel: string;
  /** Index of the argument (root) it came from, for unique output names. */
  root: number;
}

export function isImageName(name: string): boolean {
  const l = name.toLowerCase();
  return IMAGE_EXTENSIONS.some((e) => l.endsWith(e));
}

function toPosix(p: string): string {
  return sep === '/' ? p : p.split(sep).join('/');
}

/** Identity of a file or folder: device + inode (the same for every link to it). */
function identity(st: BigIntStats): string {
  return `${st.dev}:${st.ino}`;
}

function statOrNull(p: string): BigIntStats | null {
  try {
    return statSync(p, { bigint: true }); // follows symbolic links; null for a dangling one
  } catch {
    return null;
  }
}

/**
 * Regular files under `dir`, each file once under its shortest path. Symbolic links are followed,
 * but a folder is entered only once (identified by device + inode), so a link cycle (`loop -> .`)
 * or two links to one folder cannot repeat files. The walk is breadth-first, so the first path
 * found to a file has the fewest components; among paths of equal length one without symbolic
 * links wins, then the first in sorted order. Dot-folders, dot-files and the folders in `skip`
 * (identities) are left out.
 */
function walk(dir: string, skip: ReadonlySet<string>): string[] {
  const top = statOrNull(dir);
  const seenDirs = new Set<string>(top ? [identity(top)] : []);
  const files = new Map<string, string>();
  let level: { path: string; linked: boolean }[] = [{ path: dir, linked: false }];
  while (level.length > 0) {
    const entries: { path: string; linked: boolean; st: BigIntStats }[] = [];
    for (const d of level) {
      let names: string[];
      try {
        names = readdirSync(d.path);
      } catch (e) {
        throw new FractozoneError('EMPTY_INPUT', `cannot list folder "${printable(d.path)}": ${printable((e as Error).message)}`);
      }
      for (const name of names.sort()) {
        if (name.startsWith('.')) continue;
        const p = join(d.path, name);
        const st = statOrNull(p);
        if (st) entries.push({ path: p, linked: d.linked || isLink(p), st });
      }
    }
    // paths without links first (stable: sorted order kept within each group)
    const ordered = [...entries.filter((e) => !e.linked), ...entries.filter((e) => e.linked)];
    const next: { path: string; linked: boolean }[] = [];
    for (const e of ordered) {
      const id = identity(e.st);
      if (e.st.isDirectory()) {
        if (seenDirs.has(id) || skip.has(id)) continue;
        seenDirs.add(id);
        next.push({ path: e.path, linked: e.linked });
      } else if (e.st.isFile() && !files.has(id)) files.set(id, e.path);
    }
    level = next;
  }
  return [...files.values()];
}

function isLink(p: string): boolean {
  try {
    return lstatSync(p).isSymbolicLink();
  } catch {
    return false;
  }
}

/** Glob → RegExp over a forward-slash relative path: `**` any depth, `*` within a segment, `?` one char. */
export function globToRegExp(glob: string): RegExp {
  let re = '^';
  for (let i = 0; i < glob.length; i++) {
    const c = glob[i];
    if (c === '*') {
      if (glob[i + 1] === '*') {
        i++;
        if (glob[i + 1] === '/') {
          i++;
          re += '(?:.*/)?';
        } else re += '.*';
      } else re += '[^/]*';
    } else if (c === '?') re += '[^/]';
    else re += c.replace(/[.+^${}()|[\]\\]/g, '\\$&');
  }
  return new RegExp(re + '$');
}

function hasGlob(s: string): boolean {
  return /[*?]/.test(s);
}

/**
 * Expands the `batch` arguments into a sorted, de-duplicated input list.
 * @param args folders, glob patterns or files
 * @param skipDirs absolute folders never descended into (the output folder)
 */
export function discoverImages(args: readonly string[], skipDirs: readonly string[] = []): InputImage[] {
  const skip = new Set(skipDirs.map(statOrNull).flatMap((st) => (st ? [identity(st)] : [])));
  const seen = new Set<string>();
  const out: InputImage[] = [];
  const add = (abs: string, rel: string, root: number): void => {
    const st = statOrNull(abs);
    const key = st ? identity(st) : resolve(abs);
    if (seen.has(key)) return;
    seen.add(key);
    out.push({ abs, rel, root });
  };
  args.forEach((arg, root) => {
    if (hasGlob(arg)) {
      const norm = toPosix(arg);
      const segs = norm.split('/');
      const firstWild = segs.findIndex(hasGlob);
      const base = segs.slice(0, firstWild).join('/') || '.';
      const pattern = globToRegExp(segs.slice(firstWild).join('/'));
      const baseAbs = resolve(base);
      let st;
      try {
        st = statSync(baseAbs);
      } catch {
        throw new FractozoneError('EMPTY_INPUT', `pattern "${printable(arg)}": folder "${printable(base)}" does not exist`, 'usage');
      }
      if (!st.isDirectory()) throw new FractozoneError('EMPTY_INPUT', `pattern "${printable(arg)}": "${printable(base)}" is not a folder`, 'usage');
      const files = walk(baseAbs, skip);
      const matched = files.map((f) => ({ f, rel: toPosix(relative(baseAbs, f)) })).filter((x) => pattern.test(x.rel));
      for (const m of matched) add(m.f, m.rel, root);
      return;
    }
    const abs = resolve(arg);
    let st;
    try {
      st = statSync(abs);
    } catch {
      throw new FractozoneError('EMPTY_INPUT', `input "${printable(arg)}" does not exist`, 'usage');
    }
    if (st.isDirectory()) {
      const files = walk(abs, skip);
      for (const f of files) if (isImageName(f)) add(f, toPosix(relative(abs, f)), root);
    } else {
      add(abs, basename(abs), root);
    }
  });
  out.sort((a, b) => (a.rel < b.rel ? -1 : a.rel > b.rel ? 1 : a.root - b.root));
  return out;
}
