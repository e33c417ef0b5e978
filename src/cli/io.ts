/**
 * File I/O helpers for the shells. Every write is atomic (temp file + rename in the same folder);
 * a write that fails (disk full, no permission, read-only file system) removes its temp file and
 * becomes one FractozoneError WRITE_FAILED naming the file and the reason. Messages quote paths
 * through `printable` (no control characters reach the terminal).
 */
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync, openSync, fsyncSync, closeSync, unlinkSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, dirname, join } from 'node:path';
import { FractozoneError } from '../core/errors.js';
import { printable } from '../core/text/printable.js';

export function readInputFile(path: string): Uint8Array {
  let st;
  try {
    st = statSync(path);
  } catch {
    throw new FractozoneError('EMPTY_INPUT', `cannot read "${printable(path)}": no such file`);
  }
  if (st.isDirectory()) throw new FractozoneError('NOT_AN_IMAGE', `"${printable(path)}" is a folder, not a file`);
  try {
    const b = readFileSync(path);
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch (e) {
    throw new FractozoneError('EMPTY_INPUT', `cannot read "${printable(path)}": ${printable((e as Error).message)}`);
  }
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** Plain words for the errno codes a write can end with. */
const WRITE_REASONS: Record<string, string> = {
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  EFBIG: 'file too large for the file system',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'read-only file system',
  ENOTDIR: 'a part of the path is a file, not a folder',
  EISDIR: 'a folder is in the way',
  ENOENT: 'the folder does not exist',
  ENAMETOOLONG: 'the name is too long',
  EIO: 'input/output error',
  EMFILE: 'too many open files',
};

/** True for an error thrown by {@link writeFileAtomic} / {@link makeFolder}. */
export function isWriteFailure(e: unknown): boolean {
  return e instanceof FractozoneError && e.code === 'WRITE_FAILED';
}

/**
 * A failed file-system call as one clear line: `cannot write "PATH": no space left on the device (ENOSPC)`.
 * @param verb - what was being done ("write", "create folder")
 */
export function writeFailure(verb: string, path: string, e: unknown): FractozoneError {
  const code = (e as NodeJS.ErrnoException)?.code;
  const reason = (code && WRITE_REASONS[code]) ?? ((e as Error)?.message ?? String(e)).split('\n')[0];
  return new FractozoneError('WRITE_FAILED', `cannot ${verb} "${printable(path)}": ${printable(reason)}${code ? ` (${code})` : ''}`, 'processing');
}

/** mkdir -p with the WRITE_FAILED error of {@link writeFailure}. */
export function makeFolder(dir: string): void {
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw writeFailure('create folder', dir, e);
  }
}

let tmpCounter = 0;

/** Name of the temp file of a write in progress: `.<name>.<pid>.<n>.tmp` beside the target. */
export function tempNameFor(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${++tmpCounter}.tmp`);
}

/** Matches the temp files {@link tempNameFor} makes (any process id). */
export const TEMP_FILE_RE = /^\..+\.\d+\.\d+\.tmp$/;

/**
 * Write `data` to `path` atomically: a crash leaves either the old file or the new one, never half.
 * @throws FractozoneError WRITE_FAILED (the temp file is removed; the old file, if any, is untouched)
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  makeFolder(dirname(path));
  const tmp = tempNameFor(path);
  try {
    writeFileSync(tmp, data);
    const fd = openSync(tmp, 'r');
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
  } catch (e) {
    try {
      unlinkSync(tmp);
    } catch {
      /* already gone, or never made */
    }
    throw writeFailure('write', path, e);
  }
}

/** JSON with a trailing newline, 2-space indent; numbers as JS prints them. */
export function toJsonText(v: unknown): string {
  return JSON.stringify(v, null, 2) + '\n';
}

/** One message line on stderr, made printable (control characters escaped). */
export function stderrLine(line: string): void {
  process.stderr.write(`${printable(line)}\n`);
}
