/** Spawns the built CLI (dist/cli/main.js; built once here if missing). */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../src/core/caution.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const main = join(root, 'dist/cli/main.js');
const materials = join(root, 'tests/fixtures/tcd/materials.json');

function run(...args: string[]): { code: number; out: string; err: string } {
  const r = spawnSync(process.execPath, [main, ...args], { encoding: 'utf8', cwd: root });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

beforeAll(() => {
  if (!existsSync(join(root, 'dist/cli/commands/criticalDistance.js'))) execFileSync('npm', ['run', 'build'], { cwd: root, stdio: 'ignore' });
}, 120_000);

describe('fractozone critical-distance', () => {
  it('--toughness 60 --strength 900 --json reports L_um ≈ 1414.7', () => {
    const r = run('critical-distance', '--toughness', '60', '--strength', '900', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.L_um).toBeCloseTo(1414.7, 1); // (1/π)(60/900)² m, Taylor 2007
    expect(j.interval95_um).toBeNull();
    expect(j.pointDistance_um).toBeCloseTo(707.36, 2);
    expect(j.lineDistance_um).toBeCloseTo(2829.42, 2);
    expect(j.areaRadius_um).toBeCloseTo(1414.71, 2);
    expect(j.inputs.toughness.value_MPa_sqrtm).toBe(60);
    expect(j.inputs.strength.value_MPa).toBe(900);
  });
  it('with sd: a seeded 95 % interval, reproducible', () => {
    const a = JSON.parse(run('critical-distance', '--toughness', '60', '--strength', '900', '--toughness-sd', '3', '--strength-sd', '40', '--seed', '9', '--json').out);
    const b = JSON.parse(run('critical-distance', '--toughness', '60', '--strength', '900', '--toughness-sd', '3', '--strength-sd', '40', '--seed', '9', '--json').out);
    expect(a.interval95_um).toEqual(b.interval95_um);
    expect(a.interval95_um[0]).toBeLessThan(1414.7);
    expect(a.monteCarlo).toEqual({ draws: 20000, seed: 9 });
  });
  it('imperial units and unit suffixes give the same L', () => {
    const a = JSON.parse(run('critical-distance', '--toughness', '50', '--strength', '130', '--units', 'imperial', '--json').out);
    const b = JSON.parse(run('critical-distance', '--toughness', '50ksi*sqrt(in)', '--strength', '130ksi', '--json').out);
    // (1/π)(K/σ)² with K, σ in ksi·√in and ksi gives inches: ×25400 µm (NIST SP 811: 1 in = 0.0254 m)
    const L_in = (50 / 130) ** 2 / Math.PI;
    expect(a.L_um).toBeCloseTo(L_in * 25400, 6);
    expect(b.L_um).toBeCloseTo(a.L_um, 9);
  });
  it('text output carries units on every value line', () => {
    const r = run('critical-distance', '--toughness', '60MPa*sqrt(m)', '--strength', '0.9GPa');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/critical distance L\s+1414\.7 µm/);
    for (const line of r.out.split('\n').filter((l) => /^\s+(point|line|area|critical|fracture|inherent)/.test(l))) expect(line).toMatch(/µm|MPa/);
    // the one caution of core/caution.ts closes the text
    expect(r.out.trimEnd().endsWith(CAUTION)).toBe(true);
  });
  it('material FILE:NAME and strain rate', () => {
    const s = JSON.parse(run('critical-distance', '--material', `${materials}:ZX-17 (invented)`, '--json').out);
    expect(s.L_um).toBeCloseTo(1414.71, 2);
    expect(s.inputs.material).toBe('ZX-17 (invented)');
    expect(s.interval95_um).not.toBeNull();
    expect(s.warnings).toContainEqual({ code: 'INVENTED_MATERIAL', message: 'material "ZX-17 (invented)" is invented demo data' });
    const d = JSON.parse(run('critical-distance', '--material', `${materials}:ZX-17 (invented)`, '--strain-rate', '1e3', '--json').out);
    expect(d.L_um).toBeCloseTo(1400 * Math.pow(1e3, -0.04), 6);
    expect(d.inputs.strainRate_per_s).toBe(1000);
  });
  it.each([
    [['--toughness', '60'], /--strength is required/],
    [['--toughness', 'abc', '--strength', '900'], /--toughness "abc"/],
    [['--toughness', '-60', '--strength', '900'], /positive/],
    [['--toughness', '60', '--strength', '900', '--units', 'cgs'], /--units "cgs"/],
    [['--toughness', '60', '--strength', '900', '--seed', '1.5'], /--seed "1.5" must be a whole number/],
    [['--toughness', '60', '--strength', '900', '--strain-rate', '10'], /strain-rate law/],
    [['--material', `${materials}:steel`], /no material named "steel"/],
    [['--material', 'nofile.json'], /FILE:NAME/],
  ])('invalid input %# → exit 2 with a precise message', (args, msg) => {
    const r = run('critical-distance', ...(args as string[]), '--json');
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    expect(r.err).toMatch(msg as RegExp);
    expect(r.err).toMatch(/^fractozone: error \[/);
  });
  it('--help exits 0', () => {
    const r = run('critical-distance', '--help');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/--toughness/);
  });
});

describe('fractozone fit-notches and fit-rate', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fz-tcd-'));
  // Invented notches: Creager–Paris fields per 1 kN, written as CSV paths (Creager & Paris 1967)
  const L = 300e-6;
  const s0 = 750;
  const cp = (k: number, rho: number, r: number) => ((2 * k) / Math.sqrt(Math.PI)) * (r + rho) / Math.pow(2 * r + rho, 1.5);
  const make = (name: string, k: number, rho: number) => {
    const rows = ['# invented notch, stresses at the reference load', '# reference load: 1kN', '# analysis: linear-elastic', 'distance_mm,stress_MPa'];
    for (let i = 0; i <= 2000; i++) {
      const r = (i / 2000) * 2e-3;
      rows.push(`${r * 1e3},${cp(k, rho, r)}`);
    }
    const file = join(dir, name);
    writeFileSync(file, rows.join('\n') + '\n');
    return { file, loadKN: s0 / cp(k, rho, L / 2) };
  };
  const a = make('a.csv', 0.5, 0.05e-3);
  const b = make('b.csv', 0.5, 1e-3);
  it('point method recovers the invented L and σ_0 from two curves', () => {
    const r = run('fit-notches', '--curve', `${a.file}:${a.loadKN}kN`, '--curve', `${b.file}:${b.loadKN * 1000}N`, '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.L_um).toBeCloseTo(300, 0);
    expect(j.sigma0_MPa).toBeCloseTo(750, 0);
    expect(j.residuals[0].ratio).toBeCloseTo(1, 6);
    expect(j.residuals[0].failureLoad_N).toBeCloseTo(a.loadKN * 1000, 6);
  });
  it('refuses a missing reference load, bad loads and one curve without toughness', () => {
    const noRef = join(dir, 'noref.csv');
    writeFileSync(noRef, 'distance_mm,stress_MPa\n0,300\n1,200\n2,100\n');
    expect(run('fit-notches', '--curve', `${noRef}:10kN`, '--curve', `${a.file}:10kN`).err).toMatch(/no reference load/);
    expect(run('fit-notches', '--curve', `${a.file}:10`, '--curve', `${b.file}:10kN`).code).toBe(2);
    const one = run('fit-notches', '--curve', `${a.file}:10kN`);
    expect(one.code).toBe(2);
    expect(one.err).toMatch(/one curve is not enough/);
    expect(run('fit-notches', '--curve', `${a.file}:10kN`, '--curve', `${b.file}:10kN`, '--method', 'blob').err).toMatch(/--method "blob"/);
  });
  it('fit-rate recovers A and B and evaluates with an interval', () => {
    const file = join(dir, 'pairs.csv');
    const rows = ['# invented (strain rate, L) pairs', 'strain_rate_1/s,L_um'];
    for (const [rate, f] of [[1e-3, 1.01], [1e-1, 0.99], [10, 1.0], [1e3, 1.02], [1e4, 0.98]]) rows.push(`${rate},${1200 * Math.pow(rate, -0.05) * f}`);
    writeFileSync(file, rows.join('\n'));
    const r = run('fit-rate', file, '--at', '100', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.B).toBeCloseTo(-0.05, 2);
    expect(j.A_um).toBeGreaterThan(1150);
    expect(j.A_um).toBeLessThan(1250);
    expect(j.n).toBe(5);
    expect(j.at.interval95_um[0]).toBeLessThan(j.at.L_um);
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'strain_rate_1/s,L_um\n1,100\n2,oops\n');
    const e = run('fit-rate', bad);
    expect(e.code).toBe(2);
    expect(e.err).toMatch(/bad\.csv line 3: L "oops" is not a number/);
  });
});
