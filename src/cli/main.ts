#!/usr/bin/env node
/**
 * fractozone command-line entry (the program itself is cli.ts). `measure` runs in a child Node
 * process with V8's background threads off (`--single-threaded`: no concurrent compilation,
 * parallel or concurrent GC): a one-shot measure is mostly code running its first time, and on a
 * busy machine those helper threads cost more than they save. Measured on the 12-MP bench image
 * (2026-12-03, load 7.6–9.4 on 2 cores, 5 interleaved rounds, the extra process included): CPU
 * best/median 3.15/3.52 → 2.86/3.13 s, wall 6.61/8.22 → 5.08/6.29 s; see DEVELOPERS.md
 * "Performance notes". The flag can only be given at start-up (not in NODE_OPTIONS, and setting
 * it from inside a running process crashed the GC), hence the child. The numbers are the same
 * either way (no flag changes arithmetic); `FRACTOZONE_V8_THREADS=1` keeps the background threads
 * and the one process.
 */
import { spawnSync } from 'node:child_process';
import { constants } from 'node:os';
import { fileURLToPath } from 'node:url';

const cli = fileURLToPath(new URL('./cli.js', import.meta.url));
const args = process.argv.slice(2);
const single = process.execArgv.includes('--single-threaded') || process.env.FRACTOZONE_V8_THREADS === '1';

if (args[0] === 'measure' && !single) {
  const r = spawnSync(process.execPath, [...process.execArgv, '--single-threaded', cli, ...args], { stdio: 'inherit' });
  const signal = r.signal ? constants.signals[r.signal] : undefined;
  process.exitCode = r.status ?? (signal !== undefined ? 128 + signal : 1);
} else {
  await import('./cli.js');
}
