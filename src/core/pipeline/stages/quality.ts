/**
 * Stage 9, quality: result-level rules that add warnings from the measured figures, and the
 * quality verdict of the result made from all its warnings: the worst severity among them
 * (`info` counts as `ok`), with the warnings that set it as reasons. The severities live in the
 * warning registry (core/warnings.ts); the rules below are a table, so tuning a threshold or adding a
 * rule is one line. Thresholds are our own first choice (common practice, no source), to be tuned
 * on realistic scenes.
 */
import { mergeWarnings, severityOf, warn, type Severity, type Warning, type WarningCode } from '../../warnings.js';
import type { Quality, QualityVerdict, ResultBand, ResultScale } from '../result.js';

/** What the rules read: the assembled band and scale. */
export interface RuleInput {
  band: ResultBand;
  scale: ResultScale;
}

/** A result-level rule: the warning's code, and its message when the rule applies (else null). */
export interface QualityRule {
  code: WarningCode;
  message: (r: RuleInput) => string | null;
}

const pct = (v: number): string => `${(100 * v).toFixed(0)} %`;

/** The rules, in the order their warnings are listed. */
export const QUALITY_RULES: readonly QualityRule[] = [
  { code: 'NO_BAND_FOUND', message: ({ band: b }) => (b.detected ? null : `no smooth rim band was found (${b.reason ?? 'not detected'}): check that there is none`) },
  {
    code: 'LOW_SCALE_BAR_CONFIDENCE',
    message: ({ scale: s }) =>
      s.source === 'scale-bar' && s.detectedBar && s.detectedBar.confidence < 0.75
        ? `the scale comes from a scale bar detected with confidence ${s.detectedBar.confidence.toFixed(2)} (< 0.75): check the green box on the overlay`
        : null,
  },
  {
    code: 'FEW_VALID_RAYS',
    message: ({ band: b }) => (b.detected && b.nValid < 0.5 * b.nRays && b.nValid >= 0.25 * b.nRays ? `only ${b.nValid} of ${b.nRays} rays gave a width (${pct(b.nValid / b.nRays)})` : null),
  },
  {
    code: 'VERY_FEW_VALID_RAYS',
    message: ({ band: b }) => (b.detected && b.nValid < 0.25 * b.nRays ? `only ${b.nValid} of ${b.nRays} rays gave a width (${pct(b.nValid / b.nRays)})` : null),
  },
  {
    code: 'WIDE_WIDTH_INTERVAL',
    message: ({ band: b }) => {
      const w = b.widthUm;
      if (!b.detected || !w || !(w.mean > 0)) return null;
      const rel = (w.ci95[1] - w.ci95[0]) / w.mean;
      return rel > 0.3 ? `the 95 % circumferential interval of the mean width spans ${pct(rel)} of the mean (${w.ci95[0].toFixed(1)}–${w.ci95[1].toFixed(1)} µm)` : null;
    },
  },
  { code: 'MANY_OUTLIER_RAYS', message: ({ band: b }) => (b.detected && b.nOutliers > 0.1 * b.nValid ? `${b.nOutliers} of ${b.nValid} measured rays are outliers` : null) },
  {
    // The spread of w(θ) is the band's own variation plus each ray's placement error. The per-ray
    // scatter s of the two edges (residual around a 15-ray running median, measure/uncertainty.ts)
    // is a lower bound of that error: it misses errors that run over more than ≈ 15 rays. On the
    // rendered scene set (2026-12-03) the SD of width was 0.99–4.9 × the truth's (median 1.31);
    // s ≥ ½ SD picked all 6 rows at 2.0–4.9 × (narrow and noisy bands, SEM strip noise, defocus),
    // 5 of the 10 at 1.39–1.76 × and none of the 23 below 1.39 × (plain 1.22 ×, s/SD 0.23). Missed:
    // lit notch flanks (1.4–1.7 ×), whose outer-edge error swings over half the circumference.
    // Independent generator's set (21 single-specimen images with a band): defocus_one_side 2.25 ×
    // and glints 1.88 × picked, shadow_right 1.17 × (s/SD 0.58) too; narrow_band_noise 1.65 × missed.
    // s ≥ ½ SD means the SD is overstated by ≥ 15 % if s is all placement error.
    // Threshold: our own first choice (common practice, no source).
    code: 'WIDTH_SPREAD_INFLATED',
    message: ({ band: b }) => {
      const w = b.widthUm;
      const g = b.uncertainty?.budget;
      if (!b.detected || !w || !g || !(w.sd > 0)) return null;
      const s = Math.hypot(g.boundary.perRaySdUm, g.outerEdge.perRaySdUm);
      return s >= 0.5 * w.sd
        ? `the rays' own placement scatter (≈ ${s.toFixed(1)} µm per ray, boundary and outer edge) is ${pct(s / w.sd)} of the SD of width (${w.sd.toFixed(1)} µm): the SD, p05/p95 and min/max overstate how much the band varies around the circumference; the mean and its intervals allow for the scatter`
        : null;
    },
  },
];

/** The codes the rules give (re-made on every re-measure). */
export const RULE_CODES: ReadonlySet<WarningCode> = new Set(QUALITY_RULES.map((r) => r.code));

/** The warnings the rules give. */
export function ruleWarnings(input: RuleInput): Warning[] {
  const out: Warning[] = [];
  for (const r of QUALITY_RULES) {
    const m = r.message(input);
    if (m !== null) out.push(warn(r.code, m));
  }
  return out;
}

const RANK: Record<Severity, number> = { info: 0, check: 1, unreliable: 2 };
const VERDICT: Record<Severity, QualityVerdict> = { info: 'ok', check: 'check', unreliable: 'unreliable' };

/** Input of {@link judgeQuality}: the warnings of the earlier stages, the assembled band and scale. */
export interface QualityInput extends RuleInput {
  warnings: readonly Warning[];
}

/** Output of {@link judgeQuality}: all warnings (the rules' appended) and the verdict. */
export interface QualityOutput {
  warnings: Warning[];
  quality: Quality;
}

/** The quality stage: the rules' warnings appended, then the verdict from all warnings. */
export function judgeQuality(input: QualityInput): QualityOutput {
  const warnings = mergeWarnings(input.warnings, ruleWarnings(input));
  return { warnings, quality: assessQuality(warnings) };
}

/** The verdict from the warnings: worst severity (`ok` with none or only `info`), the others as reasons. */
export function assessQuality(warnings: readonly Warning[]): Quality {
  let worst: Severity = 'info';
  for (const w of warnings) if (RANK[severityOf(w.code)] > RANK[worst]) worst = severityOf(w.code);
  return { verdict: VERDICT[worst], reasons: warnings.filter((w) => severityOf(w.code) !== 'info').map((w) => ({ code: w.code, message: w.message })) };
}
