/**
 * `--shard i/n`: image k of the sorted full input list (0-based) belongs to shard (k mod n) + 1.
 * Deterministic for the same inputs, balanced to within one image, independent of worker count.
 */
import { FractozoneError } from '../../core/errors.js';

export interface Shard {
  index: number;
  count: number;
}

export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (!m) throw new FractozoneError('BAD_PARAMETER', `--shard "${text}" must look like 1/8 (this shard / number of shards)`);
  const index = Number(m[1]);
  const count = Number(m[2]);
  if (count < 1 || index < 1 || index > count) throw new FractozoneError('BAD_PARAMETER', `--shard "${text}": the shard number must be 1..${Math.max(1, count)}`);
  return { index, count };
}

export function inShard(k: number, shard: Shard | null): boolean {
  return shard === null || k % shard.count === shard.index - 1;
}
