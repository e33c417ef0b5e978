/**
 * `fractozone fit-notches`: fit L and σ_0 from stress–distance curves of notches and their failure
 * loads (point, line or area method), or L from one notch and a known K_c.
 */
import type { Command } from 'commander';
import {
  CAUTION,
  FractozoneError,
  fitNotches,
  fitWithToughness,
  methodDistances,
  parseCurveCsv,
  parseLoad,
  parseQuantity,
  scaleCurve,
  type Load,
  type NotchSpecimen,
  type TcdMethod,
  TOOL_NAME,
  TOOL_VERSION,
  type Warning,
} from '../../core/index.js';
import { toJsonText } from '../io.js';
import { readText } from './criticalDistance.js';

interface Options {
  curve: string[];
  method: string;
  referenceLoad?: string;
  toughness?: string;
  json?: boolean;
}

function fmt(v: number, digits = 5): string {
  return Number(v.toPrecision(digits)).toString();
}

/** A JSON value (the output record). */
type JsonValue = string | number | boolean | null | JsonValue[] | { [key: string]: JsonValue };

/** Register `fit-notches`. */
export function register(program: Command): void {
  program
    .command('fit-notches')
    .description(
      'Fit the critical distance L and inherent strength σ_0 from stress–distance curves (CSV) of two or more notch geometries and their failure loads.',
    )
    .option(
      '--curve <FILE:LOAD>',
      'a curve CSV and its failure load, e.g. a.csv:12.5kN or b.csv:250MPa (repeat for each notch)',
      (v: string, prev: string[]) => [...prev, v],
      [] as string[],
    )
    .option('--method <m>', 'point, line or area', 'point')
    .option('--reference-load <LOAD>', 'load at which curves without a "# reference load:" line were computed, e.g. 1kN')
    .option('--toughness <K>', 'known fracture toughness (MPa·√m unless a unit is given); with one curve, fits L from it')
    .option('--json', 'print JSON only (messages go to stderr)')
    .action((opts: Options) => {
      const method = opts.method as TcdMethod;
      if (!['point', 'line', 'area'].includes(method)) throw new FractozoneError('BAD_PARAMETER', `--method "${opts.method}" must be point, line or area`);
      if (opts.curve.length === 0) throw new FractozoneError('BAD_PARAMETER', 'give at least one --curve FILE:LOAD');
      const defaultRef = opts.referenceLoad !== undefined ? parseLoad(opts.referenceLoad, '--reference-load') : undefined;
      let dimension: Load['dimension'] | undefined;
      const specimens: NotchSpecimen[] = opts.curve.map((spec) => {
        const i = spec.lastIndexOf(':');
        if (i <= 0 || i === spec.length - 1) throw new FractozoneError('BAD_PARAMETER', `--curve "${spec}" must be FILE:LOAD, e.g. a.csv:12.5kN`);
        const file = spec.slice(0, i);
        const load = parseLoad(spec.slice(i + 1), `--curve ${file} failure load`);
        const parsed = parseCurveCsv(readText(file), file);
        const ref = parsed.referenceLoad ?? defaultRef;
        if (!ref) {
          throw new FractozoneError('BAD_CURVE', `${file}: no reference load; add a line "# reference load: 10kN" to the file or pass --reference-load`);
        }
        if (ref.dimension !== load.dimension) {
          throw new FractozoneError('BAD_PARAMETER', `${file}: the failure load is a ${load.dimension} but the reference load is a ${ref.dimension}`);
        }
        if (dimension && dimension !== load.dimension) throw new FractozoneError('BAD_PARAMETER', 'all failure loads must be forces, or all nominal stresses');
        dimension = load.dimension;
        return { name: file, unitCurve: scaleCurve(parsed.curve, 1 / ref.value), failureLoad: load.value };
      });
      const loadKey = dimension === 'force' ? 'N' : 'MPa';
      let result: { [key: string]: JsonValue };
      let text: string[];
      let warnings: Warning[] = [];
      if (specimens.length === 1) {
        if (opts.toughness === undefined) throw new FractozoneError('BAD_PARAMETER', 'one curve is not enough: give a second --curve, or --toughness to fit L from one notch');
        const K = parseQuantity(opts.toughness, 'toughness', '--toughness');
        const f = fitWithToughness(K, specimens[0], method);
        result = { method, solver: 'known toughness', L_um: f.L_um, sigma0_MPa: f.sigma0_MPa, toughness_MPa_sqrtm: K, ...methodDistances(f.L_um), residuals: [], warnings: [] };
        text = [
          `Critical distance from one notch and K_c (${method} method)`,
          `  fracture toughness K_c  ${fmt(K)} MPa·√m`,
          `  critical distance L     ${fmt(f.L_um)} µm`,
          `  inherent strength σ_0   ${fmt(f.sigma0_MPa)} MPa`,
        ];
      } else {
        if (opts.toughness !== undefined) throw new FractozoneError('BAD_PARAMETER', '--toughness is used with a single curve only; with two or more curves L and σ_0 are both fitted');
        const f = fitNotches(specimens, method);
        result = {
          method,
          solver: f.solver,
          L_um: f.L_um,
          sigma0_MPa: f.sigma0_MPa,
          ...methodDistances(f.L_um),
          rmsLogResidualPct: f.rmsLogResidualPct,
          residuals: f.residuals.map((r) => ({
            curve: r.name,
            [`failureLoad_${loadKey}`]: r.failureLoad,
            [`predictedLoad_${loadKey}`]: r.predictedLoad,
            ratio: r.ratio,
          })),
          warnings: f.warnings.map((w) => ({ code: w.code, message: w.message })),
        };
        warnings = f.warnings;
        text = [
          `Critical distance from ${specimens.length} notches (${method} method, ${f.solver})`,
          `  critical distance L     ${fmt(f.L_um)} µm`,
          `  inherent strength σ_0   ${fmt(f.sigma0_MPa)} MPa`,
          `  rms log residual        ${fmt(f.rmsLogResidualPct, 3)} %`,
          ...f.residuals.map((r) => `  ${r.name}: failure ${fmt(r.failureLoad)} ${loadKey}, predicted ${fmt(r.predictedLoad)} ${loadKey}, ratio ${fmt(r.ratio, 4)}`),
          ...f.warnings.map((w) => `  note: ${w.message} [${w.code}]`),
        ];
      }
      if (opts.json) {
        for (const w of warnings) process.stderr.write(`fractozone: note: ${w.message} [${w.code}]\n`);
        process.stdout.write(toJsonText({ tool: TOOL_NAME, version: TOOL_VERSION, ...result }));
      } else {
        process.stdout.write([...text, CAUTION].join('\n') + '\n');
      }
    });
}
