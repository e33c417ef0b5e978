/**
 * `fractozone critical-distance`: L = (1/π)(K_c/σ_0)² with method distances and a seeded Monte Carlo
 * interval. Thin shell: parses options, reads the material sheet, calls core.
 */
import type { Command } from 'commander';
import {
  CAUTION,
  FractozoneError,
  parseMaterialSheet,
  parseQuantity,
  resolveCriticalDistance,
  selectMaterial,
  splitMaterialRef,
  TOOL_NAME,
  TOOL_VERSION,
  type EchoedValue,
  type Material,
  type QuantityInput,
  type UnitSystem,
} from '../../core/index.js';
import { readInputFile, toJsonText } from '../io.js';


/** Read a text file for a command (UTF-8). */
export function readText(path: string): string {
  return new TextDecoder('utf-8').decode(readInputFile(path));
}

/** Strict number option parser (rejects "", "12abc", NaN). */
export function parseNumberOption(text: string, what: string, opts: { integer?: boolean; min?: number; max?: number } = {}): number {
  const s = String(text).trim();
  const v = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(s) ? Number(s) : NaN;
  if (!Number.isFinite(v)) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" is not a number`);
  if (opts.integer && !Number.isInteger(v)) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be a whole number`);
  if (opts.min !== undefined && v < opts.min) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be at least ${opts.min}`);
  if (opts.max !== undefined && v > opts.max) throw new FractozoneError('BAD_PARAMETER', `${what} "${text}" must be at most ${opts.max}`);
  return v;
}

/** Strain rate in 1/s: a plain number or with the suffix "/s" or "1/s". */
export function parseStrainRate(text: string): number {
  const s = String(text).trim().replace(/\s*(1\/s|\/s|s\^-1|s-1)$/, '');
  const v = parseNumberOption(s, '--strain-rate');
  if (!(v > 0)) throw new FractozoneError('BAD_PARAMETER', `--strain-rate "${text}" must be a positive number of 1/s`);
  return v;
}

/** Load a material from a `FILE:NAME` reference. */
export function loadMaterial(ref: string): Material {
  const { file, name } = splitMaterialRef(ref);
  return selectMaterial(parseMaterialSheet(readText(file), file), name, file);
}

interface Options {
  toughness?: string;
  strength?: string;
  toughnessSd?: string;
  strengthSd?: string;
  units: string;
  material?: string;
  strainRate?: string;
  allowExtrapolation?: boolean;
  seed: string;
  draws: string;
  json?: boolean;
}

function fmt(v: number, digits = 5): string {
  return Number(v.toPrecision(digits)).toString();
}

function echoText(e: EchoedValue): string {
  const sc = e.sd !== null ? ` ± ${fmt(e.sd)} ${e.unit} (sd)` : e.interval95 !== null ? ` in ${fmt(e.interval95[0])}–${fmt(e.interval95[1])} ${e.unit}` : '';
  return `${fmt(e.value)} ${e.unit}${sc}  [${e.source}]`;
}

/** An echoed input in the JSON output: value, sd and interval under unit-carrying keys, source, the text given. */
type EchoRecord = Record<string, number | [number, number] | string | null>;

function echoJson(e: EchoedValue, key: string, given?: string): EchoRecord {
  return {
    [`value_${key}`]: e.value,
    [`sd_${key}`]: e.sd,
    [`interval95_${key}`]: e.interval95,
    source: e.source,
    ...(given !== undefined ? { given } : {}),
  };
}

/** Register `critical-distance`. */
export function register(program: Command): void {
  program
    .command('critical-distance')
    .description('Critical distance L = (1/π)(K_c/σ_0)² (Theory of Critical Distances) with point, line and area method distances and a 95 % interval.')
    .option('--toughness <K>', 'fracture toughness K_c, e.g. 60, 60MPa*sqrt(m), 55ksi*sqrt(in) (bare numbers use --units)')
    .option('--strength <s>', 'inherent strength σ_0, e.g. 900, 900MPa, 130ksi, 0.9GPa (bare numbers use --units)')
    .option('--toughness-sd <K>', 'standard deviation of K_c (same unit rules), for the Monte Carlo interval')
    .option('--strength-sd <s>', 'standard deviation of σ_0 (same unit rules)')
    .option('--units <system>', 'unit system for bare numbers: si (MPa, MPa·√m) or imperial (ksi, ksi·√in)', 'si')
    .option('--material <FILE:NAME>', 'take K_c, σ_0 (and strain-rate laws) from a material sheet; typed values override it')
    .option('--strain-rate <rate>', 'strain rate in 1/s (needs a material with a strain-rate law)')
    .option('--allow-extrapolation', 'accept strain rates outside a tabulated law (a warning is reported)')
    .option('--seed <n>', 'Monte Carlo seed (whole number 0 … 4294967295)', '1')
    .option('--draws <n>', 'Monte Carlo draws', '20000')
    .option('--json', 'print JSON only (messages go to stderr)')
    .action((opts: Options) => {
      if (opts.units !== 'si' && opts.units !== 'imperial') {
        throw new FractozoneError('BAD_PARAMETER', `--units "${opts.units}" must be si or imperial`);
      }
      const system = opts.units as UnitSystem;
      const material = opts.material !== undefined ? loadMaterial(opts.material) : undefined;
      if (!material && opts.toughness === undefined) throw new FractozoneError('BAD_PARAMETER', '--toughness is required (or --material FILE:NAME)');
      if (!material && opts.strength === undefined) throw new FractozoneError('BAD_PARAMETER', '--strength is required (or --material FILE:NAME)');
      if (opts.toughnessSd !== undefined && opts.toughness === undefined) throw new FractozoneError('BAD_PARAMETER', '--toughness-sd needs --toughness');
      if (opts.strengthSd !== undefined && opts.strength === undefined) throw new FractozoneError('BAD_PARAMETER', '--strength-sd needs --strength');
      const q = (v: string | undefined, sd: string | undefined, dim: 'toughness' | 'stress', name: string): QuantityInput | undefined => {
        if (v === undefined) return undefined;
        const out: QuantityInput = { value: parseQuantity(v, dim, `--${name}`, system), source: 'command line' };
        if (sd !== undefined) out.sd = parseQuantity(sd, dim, `--${name}-sd`, system, true);
        return out;
      };
      const seed = parseNumberOption(opts.seed, '--seed', { integer: true, min: 0, max: 4294967295 });
      const draws = parseNumberOption(opts.draws, '--draws', { integer: true, min: 100, max: 10_000_000 });
      const r = resolveCriticalDistance({
        material,
        toughness: q(opts.toughness, opts.toughnessSd, 'toughness', 'toughness'),
        strength: q(opts.strength, opts.strengthSd, 'stress', 'strength'),
        strainRate: opts.strainRate !== undefined ? parseStrainRate(opts.strainRate) : undefined,
        allowExtrapolation: opts.allowExtrapolation === true,
        seed,
        draws,
      });
      for (const w of r.warnings) if (opts.json) process.stderr.write(`fractozone: note: ${w.message} [${w.code}]\n`);
      if (opts.json) {
        process.stdout.write(
          toJsonText({
            tool: TOOL_NAME,
            version: TOOL_VERSION,
            L_um: r.L_um,
            interval95_um: r.interval95_um,
            median_um: r.median_um,
            deltaInterval95_um: r.deltaInterval95_um,
            pointDistance_um: r.pointDistance_um,
            lineDistance_um: r.lineDistance_um,
            areaRadius_um: r.areaRadius_um,
            basis: r.basis,
            inputs: {
              material: r.inputs.material,
              invented: r.inputs.invented,
              toughness: echoJson(r.inputs.toughness, 'MPa_sqrtm', opts.toughness),
              strength: echoJson(r.inputs.strength, 'MPa', opts.strength),
              strainRate_per_s: r.inputs.strainRate_per_s,
              units: system,
            },
            monteCarlo: r.monteCarlo,
            warnings: r.warnings,
          }),
        );
        return;
      }
      const lines = [
        'Critical distance, L = (1/π)(K_c/σ_0)² (Taylor, The Theory of Critical Distances, 2007)',
        ...(r.inputs.material ? [`  material                   ${r.inputs.material}${r.inputs.invented ? ' (invented demo data)' : ''}`] : []),
        `  fracture toughness K_c     ${echoText(r.inputs.toughness)}`,
        `  inherent strength σ_0      ${echoText(r.inputs.strength)}`,
        ...(r.inputs.strainRate_per_s !== null ? [`  strain rate                ${r.inputs.strainRate_per_s} 1/s  (${r.basis})`] : []),
        `  critical distance L        ${fmt(r.L_um)} µm`,
        r.interval95_um
          ? `  95 % interval              ${fmt(r.interval95_um[0])} – ${fmt(r.interval95_um[1])} µm${r.monteCarlo ? ` (Monte Carlo, ${r.monteCarlo.draws} draws, seed ${r.monteCarlo.seed}; median ${fmt(r.median_um as number)} µm)` : ' (fit)'}`
          : '  95 % interval              none (no scatter given)',
        ...(r.deltaInterval95_um ? [`  first-order interval       ${fmt(r.deltaInterval95_um[0])} – ${fmt(r.deltaInterval95_um[1])} µm`] : []),
        `  point method, r = L/2      ${fmt(r.pointDistance_um)} µm`,
        `  line method, 0 … 2L        ${fmt(r.lineDistance_um)} µm`,
        `  area method, radius L      ${fmt(r.areaRadius_um)} µm`,
        ...r.warnings.map((w) => `  note: ${w.message} [${w.code}]`),
        CAUTION,
      ];
      process.stdout.write(lines.join('\n') + '\n');
    });
}
