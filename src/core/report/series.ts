/**
 * Series analysis of a batch: band width against strain rate, per notch shape.
 *
 * - Groups: notch × strain rate; per group the number of images, the mean of the per-image mean
 *   widths with a Student-t 95 % interval (n ≥ 2: the series interval, from the between-specimen
 *   sd; for one image its own measurement interval), the mean critical distance L, the mean
 *   ratio, the per-image verdict counts and the group's own verdict (series interval against L).
 * - Power law per notch: w(ε̇) = A·ε̇^B fitted by least squares on log10 w = log10 A + B·log10 ε̇
 *   over the images (simple-statistics `linearRegression`, `rSquared`), shown next to the
 *   material's L(ε̇) (the per-image L values, averaged per strain rate).
 *
 * References:
 * [1] D. Taylor, The Theory of Critical Distances, Elsevier 2007 (L = (1/π)(K_c/σ0)², rate laws).
 * [2] NIST/SEMATECH e-Handbook of Statistical Methods, §7.2.2.1 (confidence interval of a mean
 *     with the t distribution) and §4.1.4.1 (linear least squares).
 */
import { linearRegression, rSquared } from 'simple-statistics';
import { studentTInv } from '../measure/tdist.js';
import type { BatchEntry } from './csv.js';
import { compareWidthWithL, type CompareResult } from '../tcd/compare.js';

/**
 * The group interval: Student t over the per-image means with the between-specimen sd (n ≥ 2; its
 * lower end cut at 0), or the one image's measurement interval (its circumferential interval in
 * results without one).
 */
function groupInterval(entries: readonly BatchEntry[], ws: readonly number[], m: number): { ci: [number, number] | null; sd: number | null; ciBasis: SeriesGroup['ciBasis'] } {
  if (ws.length >= 2) {
    const sd = sampleSd([...ws]);
    const h = (studentTInv(0.975, ws.length - 1) * sd) / Math.sqrt(ws.length);
    // a band width is not negative: with 2–3 images (t = 12.7 / 4.3) the t interval can reach below
    // 0, and the interval cut at 0 covers the true mean at least as often as the uncut one
    return { ci: [Math.max(0, m - h), m + h], sd, ciBasis: 'series' };
  }
  const band = entries[0].result?.band;
  const mc = band?.uncertainty?.measurementCi95Um;
  const c = mc ?? band?.widthUm?.ci95;
  if (Array.isArray(c) && num(c[0]) !== null && num(c[1]) !== null) return { ci: [c[0], c[1]], sd: null, ciBasis: mc ? 'measurement' : 'circumferential' };
  return { ci: null, sd: null, ciBasis: null };
}

/**
 * The group's verdict: mean of the per-image means and the group interval against L with its
 * interval (tcd/compare.ts); L, its interval, the reference and the tolerance from the group's
 * images (all must share one L, else no verdict). Null without an L or an interval.
 */
function groupVerdict(entries: readonly BatchEntry[], m: number, ci: [number, number] | null, ciBasis: SeriesGroup['ciBasis']): SeriesGroup['seriesVerdict'] {
  const withL = entries.map((e) => e.result).filter((r) => r?.criticalDistance && r.comparison);
  if (!ci || !withL.length || withL.length !== entries.length) return null;
  const cd = withL[0]!.criticalDistance!;
  const cmp = withL[0]!.comparison!;
  if (withL.some((r) => Math.abs(r!.criticalDistance!.L_um - cd.L_um) > 1e-9 * cd.L_um)) return null;
  try {
    const c = compareWidthWithL({ widthUm: { mean: m, ci95: ci }, L_um: cd.L_um, L_interval95_um: cd.interval95_um, reference: cmp.reference, tolerancePct: cmp.tolerancePct });
    const wText = ciBasis === 'series' ? 'the series interval (Student t over the per-image means)' : `the one image's ${ciBasis} interval`;
    const lText = cd.interval95_um ? 'the 95 % interval of L' : `${cd.intervalNote ?? 'L has no interval'} (L taken as exact)`;
    return { ...c, note: `${c.note} Interval from ${wText} and ${lText}.` };
  } catch {
    return null;
  }
}

/** One notch × strain-rate group. Lengths in µm, strain rate in 1/s. */
export interface SeriesGroup {
  notch: string;
  strainRatePerS: number;
  n: number;
  files: string[];
  meanWidthUm: number;
  /** 95 % interval of the group mean (t-based for n ≥ 2, the image's own interval for n = 1). */
  ci95Um: [number, number] | null;
  /** Which interval `ci95Um` is: the series interval, or the one image's measurement (or circumferential) interval. */
  ciBasis: 'series' | 'measurement' | 'circumferential' | null;
  /** Between-specimen sd of the per-image means (n ≥ 2), µm. */
  sdUm: number | null;
  L_um: number | null;
  ratio: number | null;
  /** Per-image verdict counts. */
  verdicts: Record<string, number>;
  /** The group's own verdict: the group mean and `ci95Um` against the group's L and its interval, or null. */
  seriesVerdict: (CompareResult & { note: string }) | null;
}

/** w = A·ε̇^B with w in µm and ε̇ in 1/s; r2 of the log–log regression. */
export interface PowerLawFit {
  A_um: number;
  B: number;
  r2: number;
  n: number;
}

export interface NotchSeries {
  notch: string;
  groups: SeriesGroup[];
  fit: PowerLawFit | null;
  /** Why there is no fit (fewer than two strain rates, …). */
  fitNote?: string;
}

export interface SeriesAnalysis {
  notches: NotchSeries[];
  /** Material L(ε̇): mean per-image L at each strain rate, sorted by rate. */
  lCurve: { strainRatePerS: number; L_um: number }[];
  /** Images left out of the series and why (no strain rate, no band, failed). */
  excluded: { file: string; reason: string }[];
}

function num(v: unknown): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

function mean(xs: number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

function sampleSd(xs: number[]): number {
  const m = mean(xs);
  let s = 0;
  for (const x of xs) s += (x - m) * (x - m);
  return Math.sqrt(s / (xs.length - 1));
}

/** Label for entries without a notch value. */
export const NO_NOTCH = '(no notch given)';

/**
 * Groups a batch by notch and strain rate and fits the power law per notch.
 * @param entries batch entries (any status; only `ok` entries with a strain rate > 0 and a mean
 *   width > 0 enter the series, the rest are listed in `excluded`)
 * @returns groups sorted by notch then strain rate, fits, the L(ε̇) points
 */
export function analyseSeries(entries: readonly BatchEntry[]): SeriesAnalysis {
  const excluded: { file: string; reason: string }[] = [];
  type Pt = { e: BatchEntry; rate: number; w: number };
  const byNotch = new Map<string, Pt[]>();
  const lByRate = new Map<number, number[]>();
  for (const e of entries) {
    const L = num(e.result?.criticalDistance?.L_um);
    if (e.strainRatePerS !== null && e.strainRatePerS > 0 && L !== null && L > 0) {
      const list = lByRate.get(e.strainRatePerS) ?? [];
      list.push(L);
      lByRate.set(e.strainRatePerS, list);
    }
    if (e.status !== 'ok') {
      excluded.push({ file: e.file, reason: e.status === 'error' ? 'failed' : 'no band found' });
      continue;
    }
    const w = num(e.result?.band?.widthUm?.mean);
    if (w === null || w <= 0) {
      excluded.push({ file: e.file, reason: 'no mean width' });
      continue;
    }
    if (e.strainRatePerS === null || !(e.strainRatePerS > 0)) {
      excluded.push({ file: e.file, reason: 'no strain rate' });
      continue;
    }
    const notch = e.metadata.notch && e.metadata.notch.trim() !== '' ? e.metadata.notch : NO_NOTCH;
    const list = byNotch.get(notch) ?? [];
    list.push({ e, rate: e.strainRatePerS, w });
    byNotch.set(notch, list);
  }

  const notches: NotchSeries[] = [];
  for (const notch of [...byNotch.keys()].sort()) {
    const pts = byNotch.get(notch)!;
    const byRate = new Map<number, Pt[]>();
    for (const p of pts) {
      const l = byRate.get(p.rate) ?? [];
      l.push(p);
      byRate.set(p.rate, l);
    }
    const groups: SeriesGroup[] = [];
    for (const rate of [...byRate.keys()].sort((a, b) => a - b)) {
      const g = byRate.get(rate)!;
      const ws = g.map((p) => p.w);
      const m = mean(ws);
      const { ci, sd, ciBasis } = groupInterval(g.map((p) => p.e), ws, m);
      const Ls = g.map((p) => num(p.e.result?.criticalDistance?.L_um)).filter((v): v is number => v !== null);
      const ratios = g.map((p) => num(p.e.result?.comparison?.ratio)).filter((v): v is number => v !== null);
      const verdicts: Record<string, number> = {};
      for (const p of g) {
        const v = p.e.result?.comparison?.verdict;
        if (typeof v === 'string') verdicts[v] = (verdicts[v] ?? 0) + 1;
      }
      groups.push({
        notch,
        strainRatePerS: rate,
        n: g.length,
        files: g.map((p) => p.e.file),
        meanWidthUm: m,
        ci95Um: ci,
        ciBasis,
        sdUm: sd,
        L_um: Ls.length ? mean(Ls) : null,
        ratio: ratios.length ? mean(ratios) : null,
        verdicts,
        seriesVerdict: groupVerdict(g.map((p) => p.e), m, ci, ciBasis),
      });
    }
    let fit: PowerLawFit | null = null;
    let fitNote: string | undefined;
    if (byRate.size < 2) {
      fitNote = 'a power-law fit needs at least two strain rates';
    } else {
      const xy = pts.map((p) => [Math.log10(p.rate), Math.log10(p.w)]);
      const lr = linearRegression(xy);
      const line = (x: number): number => lr.m * x + lr.b;
      fit = { A_um: 10 ** lr.b, B: lr.m, r2: rSquared(xy, line), n: pts.length };
    }
    notches.push({ notch, groups, fit, ...(fitNote ? { fitNote } : {}) });
  }
  const lCurve = [...lByRate.keys()]
    .sort((a, b) => a - b)
    .map((rate) => ({ strainRatePerS: rate, L_um: mean(lByRate.get(rate)!) }));
  return { notches, lCurve, excluded };
}
