/** Band width: whether the result is current, the statistics (µm), warnings, histogram and polar profile. */
import { useMemo } from 'react';
import type { MeasureResult } from '../../../core/pipeline/index.js';
import { histogramSvg, polarProfileSvg } from '../../../core/report/svg.js';
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

function StatsTable({ r, stale }: { r: MeasureResult; stale: boolean }) {
  const w = r.band.widthUm;
  if (!r.band.detected || !w) {
    return (
      <p className="warn" data-testid="no-band">
        No smooth rim band was measured: {r.band.reason ?? 'not detected'}. Check the scale and the texture window, or correct the boundary by hand.
      </p>
    );
  }
  const rows: [string, string, string][] = [
    ['mean', 'mean', `${num(w.mean)} µm`],
    ['median', 'median', `${num(w.median)} µm`],
    ['95 % CI of the mean', 'ci', `${num(w.ci95[0])} – ${num(w.ci95[1])} µm`],
    ['95 % CI of the median', 'mci', `${num(w.medianCi95[0])} – ${num(w.medianCi95[1])} µm`],
    ['sd', 'sd', `${num(w.sd)} µm`],
    ['p05 / p95', 'p', `${num(w.p05)} / ${num(w.p95)} µm`],
    ['min / max', 'mm', `${num(w.min)} / ${num(w.max)} µm`],
    ['rays (effective)', 'n', `${w.n} of ${r.band.nRays} (${num(w.nEff, 3)})`],
    ['specimen radius', 'radius', `${num(r.specimen.radiusUm)} µm`],
  ];
  return (
    <table className={`stats${stale ? ' stale' : ''}`} data-testid="stats-table">
      <tbody>
        {rows.map(([label, id, v]) => (
          <tr key={id}>
            <th>{label}</th>
            <td data-testid={`stat-${id}`} data-value={id === 'mean' ? String(w.mean) : undefined}>
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
  return (
    <section>
      <h2>Band width</h2>
      <Banner rs={rs} result={r} />
      {r && <StatsTable r={r} stale={rs.state !== 'current'} />}
      {r && <VerdictLine r={r} stale={rs.state !== 'current'} />}
      {r && r.warnings.length > 0 && (
        <ul className={`warnings${rs.state !== 'current' ? ' stale' : ''}`} data-testid="warnings">
          {r.warnings.map((w, i) => (
            <li key={i}>{withoutCliHints(w)}</li>
          ))}
        </ul>
      )}
    </section>
  );
}
