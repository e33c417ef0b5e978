/** Band width: whether the result is current, the statistics (µm), warnings, histogram and polar profile. */
import { useMemo } from 'react';
import { histogramSvg, polarProfileSvg, specimenLines, summarise, type Figure, type IntervalFigure, type MeasureResult, type ResultSummary } from '../../../core/index.js';
import { resultStateOf, type ResultState } from '../../state/results.js';
import { withoutCliHints } from '../../state/words.js';
import { num, type PanelProps } from './types.js';

function Banner({ rs, result }: { rs: ResultState; result: MeasureResult | null }) {
  const text =
    rs.state === 'current' ? 'Current: computed for the inputs shown.' : rs.state === 'none' ? (rs.reason ?? 'Not measured yet: set the scale, then press “Find boundary”.') : (rs.reason ?? 'Out of date.');
  return (
    <p className={`result-state ${rs.state}`} data-testid="result-state" data-state={rs.state} role="status">
      {text}
      {rs.state === 'stale' && result && <span className="muted"> The numbers below belong to earlier inputs; saving is off until they are current.</span>}
    </p>
  );
}

const cell = (f: Figure | null | undefined): string => (f && f.value !== null ? `${num(f.value)}${f.unit ? ` ${f.unit}` : ''}` : '—');
const span = (f: IntervalFigure): string => (f.lo !== null && f.hi !== null ? `${num(f.lo)} – ${num(f.hi)}${f.unit ? ` ${f.unit}` : ''}` : '—');

/** The quality verdict, read first: what it means and the warnings that set it (core's words). */
function QualityBox({ s, stale }: { s: ResultSummary; stale: boolean }) {
  const q = s.quality;
  return (
    <div className={`quality quality-${q.verdict}${stale ? ' stale' : ''}`} data-testid="quality" data-verdict={q.verdict}>
      <strong>Quality: {q.headline}</strong>
      {q.reasons.length > 0 && (
        <ul>
          {q.reasons.map((w, i) => (
            <li key={i} title={w.code}>
              {withoutCliHints(w.message)}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function StatsTable({ r, s, stale }: { r: MeasureResult; s: ResultSummary; stale: boolean }) {
  const b = s.band;
  if (!b.detected) {
    return (
      <p className="warn" data-testid="no-band">
        No smooth rim band was measured: {b.reason}. Check the scale and the texture window, or correct the boundary by hand.
      </p>
    );
  }
  // labels and units from core's summary (the same in the CLI, the overlay and the reports)
  const rows: [string, string, string][] = [
    [b.mean.label, 'mean', cell(b.mean)],
    // the three intervals of the mean (core's summary; README "Uncertainty of the mean width")
    ...(b.uncertainty
      ? ([
          [b.uncertainty.measurement.label, 'u-measurement', span(b.uncertainty.measurement)],
          [b.uncertainty.circumferential.label, 'u-circumferential', span(b.uncertainty.circumferential)],
          [b.uncertainty.parameterRange ? b.uncertainty.parameterRange.label : 'parameter range', 'u-range', b.uncertainty.parameterRange ? span(b.uncertainty.parameterRange) : b.uncertainty.rangeNote],
          ['uncertainty budget', 'u-budget', b.uncertainty.budget],
        ] as [string, string, string][])
      : []),
    [b.median.label, 'median', cell(b.median)],
    ...(b.uncertainty ? [] : ([[b.ci95.label, 'ci', span(b.ci95)]] as [string, string, string][])),
    [b.medianCi95.label, 'mci', span(b.medianCi95)],
    [b.sd.label, 'sd', cell(b.sd)],
    [`${b.p05.label} / ${b.p95.label}`, 'p', `${num(b.p05.value)} / ${cell(b.p95)}`],
    [`${b.min.label} / ${b.max.label}`, 'mm', `${num(b.min.value)} / ${cell(b.max)}`],
    ['rays (effective)', 'n', `${b.n} of ${r.band.nRays} (${num(b.nEff, 3)})`],
    [s.specimen.radius.label, 'radius', cell(s.specimen.radius)],
  ];
  return (
    <table className={`stats${stale ? ' stale' : ''}`} data-testid="stats-table">
      <tbody>
        {rows.map(([label, id, v]) => (
          <tr key={id}>
            <th>{label}</th>
            <td data-testid={`stat-${id}`} data-value={id === 'mean' ? String(b.mean.value) : undefined}>
              {v}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** One line with the comparison of the width with L, when there is one. */
function VerdictLine({ r, stale }: { r: MeasureResult; stale: boolean }) {
  const c = r.comparison;
  if (!c) return null;
  return (
    <p className={`verdict-line${stale ? ' stale' : ''}`} data-testid="verdict-line">
      width / {c.reference} = <strong>{num(c.ratio, 3)}</strong> (95 %: {num(c.ratioInterval95[0], 3)} – {num(c.ratioInterval95[1], 3)}): <strong>{c.verdict}</strong> (±{num(c.tolerancePct, 3)} %)
    </p>
  );
}

/** Several specimens in the frame (both halves): each mean and verdict, the difference of the halves; the table is A's. */
function SpecimensLines({ r, stale }: { r: MeasureResult; stale: boolean }) {
  const lines = specimenLines(r);
  if (!lines.length) return null;
  return (
    <p className={`specimens-line${stale ? ' stale' : ''}`} data-testid="specimens-line">
      {lines.map((l, i) => (
        <span key={i}>
          {i > 0 && <br />}
          {l}
        </span>
      ))}
    </p>
  );
}

/** Histogram and polar profile of the widths (folded away when space is short). */
export function Plots({ r }: { r: MeasureResult }) {
  const svg = useMemo(() => {
    const widths = r.band.profile.filter((q) => q.valid && q.widthUm !== null).map((q) => q.widthUm as number);
    return { hist: histogramSvg(widths, { width: 280, height: 160 }), polar: polarProfileSvg(r.band.profile, { size: 200 }) };
  }, [r]);
  return (
    <details className="plots" open={window.innerHeight > 860}>
      <summary>Width histogram and profile around the circumference</summary>
      <div className="plot" aria-label="width histogram" dangerouslySetInnerHTML={{ __html: svg.hist }} />
      <div className="plot" aria-label="polar width profile" dangerouslySetInnerHTML={{ __html: svg.polar }} />
    </details>
  );
}

export function ResultsPanel(p: PanelProps) {
  const rs = resultStateOf(p.doc, p.series);
  const r = p.doc.result;
  const s = useMemo(() => (r ? summarise(r) : null), [r]);
  const stale = rs.state !== 'current';
  return (
    <section>
      <h2>Band width</h2>
      <Banner rs={rs} result={r} />
      {r && s && <QualityBox s={s} stale={stale} />}
      {r && s && <StatsTable r={r} s={s} stale={stale} />}
      {r && <VerdictLine r={r} stale={stale} />}
      {r && <SpecimensLines r={r} stale={stale} />}
      {r?.model && (
        <p className={`hint${stale ? ' stale' : ''}`} data-testid="result-model" data-sha256={r.model.sha256}>
          Segmented with a taught model (SHA-256 {r.model.sha256.slice(0, 12)}…): confidence beside the boundary {num(r.model.confidence.boundary, 3)}, beside the outer edge {num(r.model.confidence.outerEdge, 3)}.
        </p>
      )}
      {s && s.notes.length > 0 && (
        <ul className={`warnings${stale ? ' stale' : ''}`} data-testid="warnings">
          {s.notes.map((w, i) => (
            <li key={i} title={w.code}>
              {withoutCliHints(w.message)}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
