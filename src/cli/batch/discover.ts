/**
 * Image discovery for `batch`: folders (recursive, image extensions only), glob patterns
 * (`*`, `?`, `**`; any file that matches), and explicit files. Sorted deterministically by the
 * relative path (code-unit order), duplicates removed.
 */
import { readdirSync, statSync, realpathSync } from 'node:fs';
import { join, relative, resolve, sep, basename } from 'node:path';
import { FractozoneError } from '../../core/errors.js';

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

/** Recursive listing of regular files under `dir`, skipping dot-folders and `skip` (absolute). */
function walk(dir: string, skip: ReadonlySet<string>, out: string[]): void {
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch (e) {
    throw new FractozoneError('EMPTY_INPUT', `cannot list folder "${dir}": ${(e as Error).message}`);
  }
  for (const name of names.sort()) {
    if (name.startsWith('.')) continue;
    const p = join(dir, name);
    let st;
    try {
      st = statSync(p);
    } catch {
      continue; // dangling link
    }
    if (st.isDirectory()) {
      if (skip.has(realOrSelf(p))) continue;
      walk(p, skip, out);
    } else if (st.isFile()) out.push(p);
  }
}

function realOrSelf(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return resolve(p);
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
  const skip = new Set(skipDirs.map(realOrSelf));
  const seen = new Set<string>();
  const out: InputImage[] = [];
  const add = (abs: string, rel: string, root: number): void => {
    const key = realOrSelf(abs);
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
        throw new FractozoneError('EMPTY_INPUT', `pattern "${arg}": folder "${base}" does not exist`, 'usage');
      }
      if (!st.isDirectory()) throw new FractozoneError('EMPTY_INPUT', `pattern "${arg}": "${base}" is not a folder`, 'usage');
      const files: string[] = [];
      walk(baseAbs, skip, files);
      const matched = files.map((f) => ({ f, rel: toPosix(relative(baseAbs, f)) })).filter((x) => pattern.test(x.rel));
      for (const m of matched) add(m.f, m.rel, root);
      return;
    }
    const abs = resolve(arg);
    let st;
    try {
      st = statSync(abs);
    } catch {
      throw new FractozoneError('EMPTY_INPUT', `input "${arg}" does not exist`, 'usage');
    }
    if (st.isDirectory()) {
      const files: string[] = [];
      walk(abs, skip, files);
      for (const f of files) if (isImageName(f)) add(f, toPosix(relative(abs, f)), root);
    } else {
      add(abs, basename(abs), root);
    }
  });
  out.sort((a, b) => (a.rel < b.rel ? -1 : a.rel > b.rel ? 1 : a.root - b.root));
  return out;
}
