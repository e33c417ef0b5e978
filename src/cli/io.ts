/** File I/O helpers for the shells. Every write is atomic (temp file + rename in the same folder). */
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync, openSync, fsyncSync, closeSync, unlinkSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, dirname, join } from 'node:path';
import { FractozoneError } from '../core/errors.js';

export function readInputFile(path: string): Uint8Array {
  let st;
  try {
    st = statSync(path);
  } catch {
    throw new FractozoneError('EMPTY_INPUT', `cannot read "${path}": no such file`);
  }
  if (st.isDirectory()) throw new FractozoneError('NOT_AN_IMAGE', `"${path}" is a folder, not a file`);
  try {
    const b = readFileSync(path);
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch (e) {
    throw new FractozoneError('EMPTY_INPUT', `cannot read "${path}": ${(e as Error).message}`);
  }
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

let tmpCounter = 0;
/** Write `data` to `path` atomically: a crash leaves either the old file or the new one, never half. */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${++tmpCounter}.tmp`);
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
      /* already gone */
    }
    throw e;
  }
}

/** JSON with a trailing newline, 2-space indent; numbers as JS prints them. */
export function toJsonText(v: unknown): string {
  return JSON.stringify(v, null, 2) + '\n';
}
