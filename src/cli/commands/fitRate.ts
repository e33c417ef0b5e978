/**
 * `fractozone fit-rate`: fit L(ε̇) = A·ε̇^B (or σ_0(ε̇)) from a CSV of (strain rate, value) pairs by
 * log–log least squares; optionally evaluate the law at a strain rate with a 95 % interval.
 */
import type { Command } from 'commander';
import { CAUTION, evaluateRateLaw, fitPowerLaw, parseRatePairsCsv, TOOL_NAME, TOOL_VERSION, warn, type Warning } from '../../core/index.js';
import { toJsonText } from '../io.js';
import { parseStrainRate, readText } from './criticalDistance.js';

interface Options {
  at?: string;
  allowExtrapolation?: boolean;
  json?: boolean;
}

function fmt(v: number, digits = 5): string {
  return Number(v.toPrecision(digits)).toString();
}

/** Register `fit-rate`. */
export function register(program: Command): void {
  program
    .command('fit-rate')
    .description('Fit a strain-rate power law y = A·ε̇^B (y = L or σ_0) to a CSV of (strain rate, value) pairs, e.g. header strain_rate_1/s,L_um.')
    .argument('<pairs.csv>', 'CSV with a strain-rate column in 1/s and an L (um, mm, m) or σ_0 (MPa, GPa, ksi) column')
    .option('--at <rate>', 'evaluate the fitted law at this strain rate (1/s)')
    .option('--allow-extrapolation', 'allow --at outside the fitted strain-rate range (a warning is reported)')
    .option('--json', 'print JSON only (messages go to stderr)')
    .action((file: string, opts: Options) => {
      const data = parseRatePairsCsv(readText(file), file);
      const fit = fitPowerLaw(data.pairs);
      const u = data.unit;
      const unitText = u === 'um' ? 'µm' : 'MPa';
      const at = opts.at !== undefined ? parseStrainRate(opts.at) : undefined;
      const ev = at !== undefined ? evaluateRateLaw(fit.law, at, opts.allowExtrapolation === true) : undefined;
      const warnings: Warning[] = ev?.warning ? [warn('RATE_EXTRAPOLATED', ev.warning)] : [];
      if (fit.n < 3) warnings.push(warn('RATE_FIT_TWO_POINTS', 'with 2 points the law passes through both exactly; no standard errors or interval'));
      const key = data.quantity === 'L' ? `L_${u}` : `sigma0_${u}`;
      if (opts.json) {
        for (const w of warnings) process.stderr.write(`fractozone: note: ${w.message} [${w.code}]\n`);
        process.stdout.write(
          toJsonText({
            tool: TOOL_NAME,
            version: TOOL_VERSION,
            quantity: data.quantity,
            law: 'power',
            rateUnit: '1/s',
            [`A_${u}`]: fit.A,
            B: fit.B,
            r2: fit.r2,
            n: fit.n,
            [`seA_${u}`]: fit.seA,
            seB: fit.seB,
            rateRange_per_s: [Math.min(...data.pairs.map((p) => p.rate)), Math.max(...data.pairs.map((p) => p.rate))],
            at: ev ? { strainRate_per_s: at, [key]: ev.value, [`interval95_${u}`]: ev.interval95, extrapolated: ev.extrapolated } : null,
            warnings,
          }),
        );
        return;
      }
      const q = data.quantity === 'L' ? 'L' : 'σ_0';
      const lines = [
        `Strain-rate law ${q}(ε̇) = A·ε̇^B, ε̇ in 1/s (log–log least squares, ${fit.n} points)`,
        `  A      ${fmt(fit.A)} ${unitText}${fit.seA !== null ? ` ± ${fmt(fit.seA, 3)} ${unitText} (standard error)` : ''}`,
        `  B      ${fmt(fit.B)}${fit.seB !== null ? ` ± ${fmt(fit.seB, 3)} (standard error)` : ''}`,
        `  R²     ${fmt(fit.r2, 4)}`,
        ...(ev
          ? [
              `  ${q} at ${at} 1/s: ${fmt(ev.value)} ${unitText}${ev.interval95 ? ` (95 % interval ${fmt(ev.interval95[0])} – ${fmt(ev.interval95[1])} ${unitText})` : ''}`,
            ]
          : []),
        ...warnings.map((w) => `  note: ${w.message} [${w.code}]`),
        CAUTION,
      ];
      process.stdout.write(lines.join('\n') + '\n');
    });
}
