#!/usr/bin/env node
// Fuzz harness for fractozone's image input (`npm run fuzz`; a 300-input run is part of `npm test`).
//
//   node scripts/fuzz/run.mjs [--count 10000] [--seed 1] [--jobs 2] [--mutator ours|zzuf]
//                             [--measure-every 20] [--timeout 10] [--max-rss-mb 1024]
//                             [--work DIR] [--report FILE.json] [--quiet]
//
// Damaged images are made from seeds — the decode fixtures in tests/fixtures/decode (written by
// PIL, tifffile and ImageMagick: PNG 1–16 bit, palette, interlaced; JPEG baseline/progressive;
// TIFF raw/LZW/Deflate/PackBits/tiled/16-bit/multi-page/float) and four small fractographs
// rendered by `fractozone render` (PNG 8/16-bit, JPEG, 16-bit TIFF) — either by our
// structure-aware mutator (scripts/fuzz/mutate.mjs: PNG chunks, JPEG markers and segments, TIFF
// IFD entries, offsets and counts, compressed data, plus generic byte damage) or by Debian's
// general-purpose `zzuf` (Sam Hocevar's multi-purpose fuzzer; random bit flips at a given ratio),
// a generator that is not ours. Every input then goes through the built CLI three ways:
//
//   1. `batch` over all inputs (the whole measurement, 2 worker processes, --image-timeout =
//      --timeout): every image must have a record; an error record must carry a known code that
//      is not a crash (PROCESSING_FAILED) or a hang (IMAGE_TIMEOUT), and a message that is one
//      printable line; the batch exits 0 or 1 with printable stderr and no stack trace;
//   2. `info --json` on chunks of 100 files: exit 0/1, one JSON record per file, every stderr line
//      one printable `fractozone: error [CODE]: …` line;
//   3. `measure FILE --json` spawned alone on every k-th input (--measure-every): exit 0/1/2, no
//      stack trace, at most one printable stderr line on failure, finished within --timeout s.
//
// Peak RSS of every process (CLI and batch workers) is recorded through scripts/fuzz/rss.mjs and
// must stay below --max-rss-mb. Findings are listed (stage, input, mutation ops) and their inputs
// kept in WORK/findings; the figures go to --report. Exit 0 when there is no finding.
import { spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { formatOf, mutate, rng } from './mutate.mjs';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const CLI = join(ROOT, 'dist/cli/main.js');
const RSS_PRELOAD = pathToFileURL(join(ROOT, 'scripts/fuzz/rss.mjs')).href;
// BAD_PARAMETER: the default texture window larger than a tiny image (a usage error, exit 2 in `measure`)
const KNOWN_CODES = new Set(['EMPTY_INPUT', 'NOT_AN_IMAGE', 'UNSUPPORTED_IMAGE', 'CORRUPT_IMAGE', 'TRUNCATED_IMAGE', 'ZERO_SIZE_IMAGE', 'IMAGE_TOO_LARGE', 'BAD_SCALE', 'NO_SPECIMEN', 'BAD_PARAMETER']);
// eslint-disable-next-line no-control-regex
const UNPRINTABLE = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029\ufeff]/;
const STACK = /^\s+at .+\(.*:\d+:\d+\)$|^\s+at .+:\d+:\d+$/m;

function parseArgs(argv) {
  const o = { count: 10000, seed: 1, jobs: Math.min(2, availableParallelism()), mutator: 'ours', measureEvery: 20, timeout: 10, maxRssMb: 1024, work: null, report: null, quiet: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const v = () => argv[++i];
    if (a === '--count') o.count = Number(v());
    else if (a === '--seed') o.seed = Number(v());
    else if (a === '--jobs') o.jobs = Number(v());
    else if (a === '--mutator') o.mutator = v();
    else if (a === '--measure-every') o.measureEvery = Number(v());
    else if (a === '--timeout') o.timeout = Number(v());
    else if (a === '--max-rss-mb') o.maxRssMb = Number(v());
    else if (a === '--work') o.work = resolve(v());
    else if (a === '--report') o.report = resolve(v());
    else if (a === '--quiet') o.quiet = true;
    else throw new Error(`unknown option ${a}`);
  }
  if (!['ours', 'zzuf'].includes(o.mutator)) throw new Error('--mutator is ours or zzuf');
  return o;
}

const EXT = { png: 'png', jpeg: 'jpg', tiff: 'tif', other: 'png' };

function cliEnv(rssDir) {
  const env = { ...process.env, FZ_RSS_DIR: rssDir, NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ''} --import=${RSS_PRELOAD}`.trim() };
  delete env.FRACTOZONE_BATCH_PROCESSOR;
  delete env.FRACTOZONE_DEBUG;
  return env;
}

/** Seed files: the committed decode fixtures and four small rendered fractographs. */
function makeSeeds(work, log) {
  const dir = join(work, 'seeds');
  mkdirSync(dir, { recursive: true });
  const fixtures = join(ROOT, 'tests/fixtures/decode');
  for (const n of readdirSync(fixtures).sort()) if (/\.(png|jpe?g|tif)$/.test(n)) copyFileSync(join(fixtures, n), join(dir, n));
  const renders = [
    ['render_gray8.png', ['--bit-depth', '8']],
    ['render_gray16.png', ['--bit-depth', '16']],
    ['render.jpg', []],
    ['render_gray16.tif', ['--bit-depth', '16']],
  ];
  for (const [name, extra] of renders) {
    if (existsSync(join(dir, name))) continue; // same work folder: rendered before (deterministic)
    const r = spawnSync(process.execPath, [CLI, 'render', '--out', join(dir, name), '--size', '240x180', '--pixel-size', '30um', '--diameter', '4.5mm', '--band-width', '700um', '--bar', '1mm', '--seed', '3', ...extra], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`render ${name} failed: ${r.stderr}`);
    rmSync(join(dir, name.replace(/\.[a-z]+$/, '') + '.truth.json'), { force: true });
    rmSync(join(dir, `${name}.truth.json`), { force: true });
  }
  const seeds = readdirSync(dir)
    .filter((n) => !n.endsWith('.json'))
    .sort()
    .map((n) => ({ name: n, bytes: new Uint8Array(readFileSync(join(dir, n))) }));
  log(`fuzz: ${seeds.length} seeds (${seeds.filter((s) => s.name.startsWith('render')).length} rendered, the rest from tests/fixtures/decode)`);
  return seeds;
}

function zzufMutate(seedBytes, seedNo, ratio, keepHead) {
  // -b 8-: leave the first 8 bytes (the format signature) alone, so more inputs reach a decoder
  const args = ['-s', String(seedNo), '-r', String(ratio), ...(keepHead ? ['-b', '8-'] : [])];
  const r = spawnSync('zzuf', args, { input: seedBytes, maxBuffer: 1 << 26 });
  if (r.error || r.status !== 0) throw new Error(`zzuf failed (${r.error?.message ?? r.stderr?.toString()}); install it with apt-get install zzuf`);
  return new Uint8Array(r.stdout);
}

/** Writes the inputs (chunks of 1000 files) and returns their descriptions. */
function makeInputs(o, seeds, work) {
  const r = rng(o.seed * 7919 + 13);
  const inputs = [];
  // rendered fractographs reach every stage of the measurement; the small fixtures cover the many
  // PNG/JPEG/TIFF kinds: each gets about half of the inputs
  const rendered = seeds.filter((s) => s.name.startsWith('render'));
  const fixtures = seeds.filter((s) => !s.name.startsWith('render'));
  for (let i = 0; i < o.count; i++) {
    const seed = r.chance(0.5) ? r.pick(rendered) : r.pick(fixtures);
    let bytes;
    let ops;
    if (o.mutator === 'zzuf') {
      const ratio = r.pick([0.0002, 0.001, 0.003, 0.006, 0.01, 0.02]);
      const keepHead = r.chance(0.7);
      bytes = zzufMutate(seed.bytes, o.seed * 1_000_003 + i, ratio, keepHead);
      ops = [`zzuf -s ${o.seed * 1_000_003 + i} -r ${ratio}${keepHead ? ' -b 8-' : ''}`];
    } else {
      ({ bytes, ops } = mutate(seed.bytes, r, seeds[r.int(seeds.length)].bytes));
    }
    const chunk = `c${String(Math.floor(i / 1000)).padStart(3, '0')}`;
    const name = `${String(i).padStart(6, '0')}.${EXT[formatOf(seed.bytes)]}`;
    const path = join(work, 'in', chunk, name);
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, bytes);
    inputs.push({ i, path, chunk, name, seed: seed.name, ops, bytes: bytes.length });
  }
  return inputs;
}

function run(args, env, timeoutMs) {
  return new Promise((res) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, [CLI, ...args], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    let hung = false;
    const timer = setTimeout(() => {
      hung = true;
      child.kill('SIGKILL');
    }, timeoutMs);
    child.on('exit', (code, signal) => {
      clearTimeout(timer);
      res({ code, signal, stdout, stderr, hung, ms: performance.now() - t0 });
    });
  });
}

/** Problems with a process's stderr: unprintable bytes, stack traces, internal errors. */
function stderrProblems(stderr) {
  const p = [];
  if (UNPRINTABLE.test(stderr.replace(/\n/g, ''))) p.push('control character on stderr');
  if (STACK.test(stderr)) p.push('stack trace on stderr');
  if (/internal error/.test(stderr)) p.push('internal error');
  return p;
}

async function batchStage(o, inputs, work, env, finding, stats) {
  const chunks = [...new Set(inputs.map((x) => x.chunk))];
  for (const chunk of chunks) {
    const these = inputs.filter((x) => x.chunk === chunk);
    const out = join(work, 'out', chunk);
    const r = await run(
      ['batch', join(work, 'in', chunk), '--out', out, '--pixel-size', '30um', '--jobs', String(o.jobs), '--image-timeout', String(o.timeout), '--worker-memory', String(o.maxRssMb), '--no-progress'],
      env,
      120_000 + these.length * 4 * o.timeout * 1000,
    );
    stats.batchMs += r.ms;
    if (r.hung || ![0, 1].includes(r.code)) finding('batch', null, `batch over ${chunk} ended with ${r.hung ? 'a hang' : `exit ${r.code} ${r.signal ?? ''}`}`);
    for (const p of stderrProblems(r.stderr)) finding('batch', null, `${p} (batch over ${chunk}): ${r.stderr.split('\n').find((l) => l.trim()) ?? ''}`);
    for (const x of these) {
      const rec = join(out, 'results', `${x.name}.json`);
      if (!existsSync(rec)) {
        finding('batch', x, 'no record written');
        continue;
      }
      const j = JSON.parse(readFileSync(rec, 'utf8'));
      const status = j.batch?.status;
      stats.batchStatus[status] = (stats.batchStatus[status] ?? 0) + 1;
      if (status !== 'error') continue;
      const { code, message } = j.error ?? {};
      stats.batchCodes[code] = (stats.batchCodes[code] ?? 0) + 1;
      if (code === 'IMAGE_TIMEOUT') finding('batch', x, `hang: no result within ${o.timeout} s`);
      else if (code === 'PROCESSING_FAILED') finding('batch', x, `worker died: ${message}`);
      else if (!KNOWN_CODES.has(code)) finding('batch', x, `unexpected error code ${code}: ${message}`);
      if (typeof message !== 'string' || message.includes('\n') || UNPRINTABLE.test(message)) finding('batch', x, `message not one printable line: ${JSON.stringify(message)}`);
    }
    if (!o.quiet) process.stderr.write(`fuzz: batch ${chunk}: ${these.length} images in ${(r.ms / 1000).toFixed(1)} s\n`);
  }
}

async function infoStage(o, inputs, env, finding, stats) {
  const groups = [];
  for (let k = 0; k < inputs.length; k += 100) groups.push(inputs.slice(k, k + 100));
  let next = 0;
  const worker = async () => {
    while (next < groups.length) {
      const g = groups[next++];
      const r = await run(['info', '--json', ...g.map((x) => x.path)], env, 30_000 + g.length * 2 * o.timeout * 1000);
      stats.infoMs += r.ms;
      stats.infoRuns++;
      if (r.hung) {
        finding('info', null, `info over ${g.length} files did not finish (${basename(g[0].path)} …)`);
        continue;
      }
      if (![0, 1].includes(r.code)) finding('info', null, `info exit ${r.code} ${r.signal ?? ''} on ${basename(g[0].path)} …`);
      for (const p of stderrProblems(r.stderr)) finding('info', null, `${p}: ${r.stderr.split('\n').find((l) => UNPRINTABLE.test(l) || STACK.test(l)) ?? ''}`);
      for (const line of r.stderr.split('\n').filter((l) => l !== '')) if (!/^fractozone: error \[[A-Z_]+\]: /.test(line)) finding('info', null, `stray stderr line: ${JSON.stringify(line.slice(0, 200))}`);
      let recs = null;
      try {
        recs = JSON.parse(r.stdout);
      } catch {
        finding('info', null, `stdout is not JSON (${basename(g[0].path)} …)`);
      }
      if (recs && recs.length !== g.length) finding('info', null, `info printed ${recs.length} records for ${g.length} files`);
      for (const rec of recs ?? []) if (rec.error) stats.infoCodes[rec.error.code] = (stats.infoCodes[rec.error.code] ?? 0) + 1;
    }
  };
  await Promise.all(Array.from({ length: o.jobs }, worker));
}

async function measureStage(o, inputs, env, finding, stats) {
  const picked = inputs.filter((x) => x.i % o.measureEvery === 0);
  let next = 0;
  const worker = async () => {
    while (next < picked.length) {
      const x = picked[next++];
      // the process gets 3 s beyond the limit for Node start-up before it is killed
      const r = await run(['measure', x.path, '--pixel-size', '30um', '--json'], env, o.timeout * 1000 + 3000);
      stats.measureRuns++;
      stats.measureExit[r.code ?? r.signal] = (stats.measureExit[r.code ?? r.signal] ?? 0) + 1;
      stats.measureMaxMs = Math.max(stats.measureMaxMs, r.ms);
      if (r.hung || r.ms > o.timeout * 1000) finding('measure', x, `took ${(r.ms / 1000).toFixed(1)} s (limit ${o.timeout} s)`);
      else if (![0, 1, 2].includes(r.code)) finding('measure', x, `exit ${r.code} ${r.signal ?? ''}`);
      for (const p of stderrProblems(r.stderr)) finding('measure', x, p);
      const lines = r.stderr.split('\n').filter((l) => l !== '');
      if (r.code !== 0 && !(lines.length === 1 && /^fractozone: error \[[A-Z_]+\]: /.test(lines[0]))) finding('measure', x, `stderr is not one error line: ${JSON.stringify(r.stderr.slice(0, 300))}`);
      if (r.code === 0) {
        try {
          JSON.parse(r.stdout);
        } catch {
          finding('measure', x, 'exit 0 but stdout is not JSON');
        }
      }
    }
  };
  await Promise.all(Array.from({ length: o.jobs }, worker));
}

function rssStage(o, rssDir, finding, stats) {
  for (const n of readdirSync(rssDir)) {
    const r = JSON.parse(readFileSync(join(rssDir, n), 'utf8'));
    const mb = r.maxRssKB / 1024;
    stats.peakRssMb[r.role] = Math.max(stats.peakRssMb[r.role] ?? 0, mb);
    stats.processes++;
    if (mb > o.maxRssMb) finding('rss', null, `a ${r.role} process peaked at ${mb.toFixed(0)} MB (limit ${o.maxRssMb} MB)`);
  }
}

async function main() {
  const o = parseArgs(process.argv.slice(2));
  if (!existsSync(CLI)) throw new Error('the CLI is not built: run `npm run build` first');
  const log = (m) => {
    if (!o.quiet) process.stderr.write(`${m}\n`);
  };
  const t0 = performance.now();
  const work = o.work ?? mkdtempSync(join(tmpdir(), 'fz-fuzz-'));
  rmSync(join(work, 'in'), { recursive: true, force: true });
  rmSync(join(work, 'out'), { recursive: true, force: true });
  const rssDir = join(work, 'rss');
  rmSync(rssDir, { recursive: true, force: true });
  mkdirSync(rssDir, { recursive: true });
  const seeds = makeSeeds(work, log);
  const inputs = makeInputs(o, seeds, work);
  log(`fuzz: ${inputs.length} inputs (${o.mutator === 'zzuf' ? 'zzuf' : 'structure-aware mutator'}, seed ${o.seed}) in ${work}`);
  const findings = [];
  const finding = (stage, x, problem) => {
    findings.push({ stage, input: x ? x.path : null, seed: x?.seed, ops: x?.ops, problem });
    if (x) {
      mkdirSync(join(work, 'findings'), { recursive: true });
      copyFileSync(x.path, join(work, 'findings', `${stage}-${x.name}`));
    }
  };
  const stats = { batchMs: 0, batchStatus: {}, batchCodes: {}, infoMs: 0, infoRuns: 0, infoCodes: {}, measureRuns: 0, measureExit: {}, measureMaxMs: 0, peakRssMb: {}, processes: 0 };
  const env = cliEnv(rssDir);
  await batchStage(o, inputs, work, env, finding, stats);
  await infoStage(o, inputs, env, finding, stats);
  log(`fuzz: info over ${inputs.length} inputs in ${stats.infoRuns} runs`);
  await measureStage(o, inputs, env, finding, stats);
  log(`fuzz: measure alone on ${stats.measureRuns} inputs`);
  rssStage(o, rssDir, finding, stats);
  const report = {
    schema: 'fractozone.fuzz-report/1',
    mutator: o.mutator === 'zzuf' ? 'zzuf (Debian package, general-purpose bit-flip fuzzer)' : 'scripts/fuzz/mutate.mjs (structure-aware)',
    seed: o.seed,
    inputs: inputs.length,
    seeds: seeds.length,
    formats: Object.fromEntries(['png', 'jpeg', 'tiff'].map((f) => [f, inputs.filter((x) => x.path.endsWith(EXT[f])).length])),
    jobs: o.jobs,
    wallS: Math.round((performance.now() - t0) / 100) / 10,
    batch: { wallS: Math.round(stats.batchMs / 100) / 10, status: stats.batchStatus, errorCodes: stats.batchCodes },
    info: { runs: stats.infoRuns, errorCodes: stats.infoCodes },
    measure: { runs: stats.measureRuns, exitCodes: stats.measureExit, slowestS: Math.round(stats.measureMaxMs / 100) / 10 },
    peakRssMb: Object.fromEntries(Object.entries(stats.peakRssMb).map(([k, v]) => [k, Math.round(v)])),
    processesMeasured: stats.processes,
    limits: { timeoutS: o.timeout, maxRssMb: o.maxRssMb },
    findings,
  };
  if (o.report) writeFileSync(o.report, JSON.stringify(report, null, 2) + '\n');
  log(
    `fuzz: ${inputs.length} inputs, ${findings.length} findings, ${report.wallS} s; batch ${JSON.stringify(stats.batchStatus)}, measure exits ${JSON.stringify(stats.measureExit)} (slowest ${report.measure.slowestS} s), peak RSS ${JSON.stringify(report.peakRssMb)} MB`,
  );
  for (const f of findings.slice(0, 30)) log(`fuzz: FINDING [${f.stage}] ${f.input ?? ''} ${f.ops ? `(${f.seed}: ${f.ops.join(', ')})` : ''}: ${f.problem}`);
  if (!o.work && findings.length === 0) rmSync(work, { recursive: true, force: true });
  else log(`fuzz: inputs kept in ${work}`);
  process.exitCode = findings.length === 0 ? 0 : 1;
}

main().catch((e) => {
  process.stderr.write(`fuzz: ${e.stack ?? e}\n`);
  process.exitCode = 2;
});
