/**
 * Short fuzz runs of the built CLI (the full 10,000-input run is `npm run fuzz`; figures in the
 * README). Two generators: our structure-aware mutator (scripts/fuzz/mutate.mjs: PNG chunks, JPEG
 * segments, TIFF IFD entries, offsets, counts) and zzuf, Debian's general-purpose fuzzer, which
 * shares nothing with our code (apt-get install zzuf; .ci/run installs it). Each checks, for every
 * damaged input through `batch`, `info` and (every 30th / 20th) `measure`: exit code 0/1/2, no
 * stack trace, no hang over 10 s, peak RSS under 1 GB, every message one printable line.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOT, requireBuild } from '../cli/batch-helpers.js';

interface FuzzReport {
  inputs: number;
  formats: Record<string, number>;
  batch: { status: Record<string, number>; errorCodes: Record<string, number> };
  measure: { runs: number; exitCodes: Record<string, number> };
  peakRssMb: Record<string, number>;
  findings: { stage: string; input: string | null; problem: string }[];
}

const WORK = mkdtempSync(join(tmpdir(), 'fz-fuzz-test-'));

function fuzz(args: string[]): FuzzReport {
  const report = join(WORK, `report-${args.join('_').replace(/[^a-z0-9]/gi, '')}.json`);
  const r = spawnSync(process.execPath, [join(ROOT, 'scripts/fuzz/run.mjs'), ...args, '--work', WORK, '--report', report, '--quiet'], { cwd: ROOT, encoding: 'utf8', timeout: 600_000 });
  expect(r.status, r.stderr).not.toBe(2); // the harness itself ran
  const rep = JSON.parse(readFileSync(report, 'utf8')) as FuzzReport;
  expect(rep.findings, JSON.stringify(rep.findings.slice(0, 5), null, 1)).toEqual([]);
  expect(r.status).toBe(0);
  return rep;
}

beforeAll(requireBuild);
afterAll(() => rmSync(WORK, { recursive: true, force: true }));

describe('fuzzing the image input', () => {
  it('300 inputs from the structure-aware mutator: no crash, hang, trace or unprintable message', () => {
    const rep = fuzz(['--count', '300', '--seed', '11', '--measure-every', '30']);
    expect(rep.inputs).toBe(300);
    for (const f of ['png', 'jpeg', 'tiff']) expect(rep.formats[f]).toBeGreaterThan(30);
    expect(rep.batch.status.error).toBeGreaterThan(50); // the damage is real: many inputs refused…
    expect((rep.batch.status.ok ?? 0) + (rep.batch.status['no-band'] ?? 0)).toBeGreaterThan(5); // …and some still measured
    expect(rep.measure.runs).toBe(10);
    expect(Math.max(...Object.values(rep.peakRssMb))).toBeLessThan(1024);
  }, 600_000);

  it('80 inputs damaged by zzuf (Debian, a general-purpose fuzzer that is not ours): the same checks', () => {
    const which = spawnSync('zzuf', ['-V'], { encoding: 'utf8' });
    expect(which.error, 'zzuf is missing: apt-get install zzuf (.ci/run installs it)').toBeUndefined();
    const rep = fuzz(['--count', '80', '--seed', '5', '--mutator', 'zzuf', '--measure-every', '20']);
    expect(rep.inputs).toBe(80);
    expect(rep.batch.status.error).toBeGreaterThan(10);
    expect(rep.measure.runs).toBe(4);
  }, 600_000);
});
