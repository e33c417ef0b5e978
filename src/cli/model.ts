/**
 * Model files for the command line: read, check and unpack a `fractozone.model/1` file (core
 * learn/model.ts), with the SHA-256 of its bytes; each file is read once per process.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { FractozoneError, isFractozoneError } from '../core/errors.js';
import { parseModel } from '../core/learn/model.js';
import { loadModel, type LoadedModel } from '../core/learn/predict.js';
import { printable } from '../core/text/printable.js';
import { sha256Hex } from './io.js';

const cache = new Map<string, LoadedModel>();

/**
 * The model in `path`, checked.
 * @throws FractozoneError BAD_MODEL (exit 2) when the file cannot be read, is not a model of this
 *   version, or is damaged; the message names the file
 */
export function readModelFile(path: string): LoadedModel {
  const abs = resolve(path);
  const known = cache.get(abs);
  if (known) return known;
  let bytes: Uint8Array;
  try {
    const b = readFileSync(abs);
    bytes = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch {
    throw new FractozoneError('BAD_MODEL', `cannot read model file "${printable(path)}"`);
  }
  try {
    const loaded = loadModel(parseModel(new TextDecoder('utf-8').decode(bytes)), sha256Hex(bytes));
    cache.set(abs, loaded);
    return loaded;
  } catch (e) {
    if (isFractozoneError(e)) throw new FractozoneError(e.code, `model file "${printable(path)}": ${e.message}`);
    throw e;
  }
}
