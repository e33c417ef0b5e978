/** Results column: statistics table, plots, material form, comparison with L, exports, caution. */
import { useMemo } from 'react';
import type { ResultView } from '../../core/report/csv.js';
import { histogramSvg, polarProfileSvg } from '../../core/report/svg.js';
import type { Doc, MaterialForm } from '../state/document.js';

/** The engineering caution shown under every result. */
export const CAUTION_TEXT =
  'Measurements and critical-distance estimates from this tool support, and do not replace, the judgement of a qualified engineer. ' +
  "Structural assessment must follow the applicable codes, standards and the responsible organisation's procedures.";

const f = (v: unknown, d = 1): string => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(d) : '—');

function NumField(props: { label: string; unit: string; value: number | null; onChange(v: number | null): void; onDone?(): void; testId?: string }) {
  return (
    <label className="field">
      <span>{props.label}</span>
      <input
        type="number"
        step="any"
        data-testid={props.testId}
        value={props.value ?? ''}
        onChange={(e) => props.onChange(e.target.value === '' ? null : Number(e.target.value))}
        onBlur={() => props.onDone?.()}
      />
      <span className="unit">{props.unit}</span>
    </label>
  );
}

/** Width statistics of a result (every number with its unit, µm). */
export function StatsTable({ result, stale }: { result: ResultView & Record<string, unknown>; stale: boolean }) {
  const w = (result.band?.widthUm ?? {}) as Record<string, unknown>;
  const ci = w.ci95 as [number, number] | undefined;
  const mci = w.medianCi95 as [number, number] | undefined;
  const rows: [string, string, string][] = [
    ['n (rays)', String(w.n ?? '—'), w.nEff !== undefined ? `effective ${f(w.nEff, 1)}` : ''],
    ['mean', `${f(w.mean)} µm`, 'mean'],
    ['median', `${f(w.median)} µm`, 'median'],
    ['sd', `${f(w.sd)} µm`, 'sd'],
    ['95 % CI of mean', ci ? `${f(ci[0])} … ${f(ci[1])} µm` : '—', 'ci'],
    ['95 % CI of median', mci ? `${f(mci[0])} … ${f(mci[1])} µm` : '—', 'mci'],
    ['p05 / p95', `${f(w.p05)} / ${f(w.p95)} µm`, 'p'],
    ['min / max', `${f(w.min)} / ${f(w.max)} µm`, 'mm'],
  ];
  return (
    <table className={`stats${stale ? ' stale' : ''}`} data-testid="stats-table" data-stale={stale ? 'true' : 'false'}>
      <tbody>
        {rows.map(([k, v, id]) => (
          <tr key={k}>
            <th>{k}</th>
            <td data-testid={`stat-${id}`} data-value={id === 'mean' ? String(w.mean ?? '') : undefined}>
              {id === 'n (rays)' ? v : v}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export interface ResultsProps {
  doc: Doc | null;
  /** `commit` false while typing (one history entry per field, closed by `onMaterialDone`). */
  onMaterial(m: MaterialForm, commit: boolean): void;
  onMaterialDone(): void;
  onMaterialFile(file: File): void;
  onExport(kind: 'json' | 'csv' | 'png' | 'html' | 'session'): void;
  onOpenSession(file: File): void;
}

/** The results column: statistics, plots, material form, comparison with L, exports, caution. */
export function Results({ doc, onMaterial, onMaterialDone, onMaterialFile, onExport, onOpenSession }: ResultsProps) {
  const r = (doc?.result ?? null) as (ResultView & Record<string, unknown>) | null;
  const plots = useMemo(() => {
    const prof = r?.band?.profile ?? [];
    const widths = prof.filter((p) => p.valid && p.widthUm !== null).map((p) => p.widthUm as number);
    return { hist: histogramSvg(widths, { width: 300, height: 170 }), polar: polarProfileSvg(prof, { size: 220 }) };
  }, [r]);
  const m = doc?.material;
  const set = (patch: Partial<MaterialForm>) => m && onMaterial({ ...m, ...patch }, true);
  const type = (patch: Partial<MaterialForm>) => m && onMaterial({ ...m, ...patch }, false);
  const cmp = (r?.comparison ?? null) as Record<string, unknown> | null;
  const L = (r?.criticalDistance ?? null) as Record<string, unknown> | null;
  const ri = cmp?.ratioInterval95 as [number, number] | undefined;
  const Li = L?.interval95_um as [number, number] | undefined;
  const implied = (cmp?.impliedToughness_MPa_sqrtm ?? null) as { K_MPa_sqrtm?: number; interval95_MPa_sqrtm?: [number, number] | null } | null;
  const impliedVal = implied?.K_MPa_sqrtm ?? null;
  const impliedCi = implied?.interval95_MPa_sqrtm ?? null;

  return (
    <aside className="results">
      <section>
        <h2>Band width</h2>
        {!doc && <p className="muted">Open an image.</p>}
        {doc && !r && <p className="muted">Run “Find boundary” to measure.</p>}
        {r && (
          <>
            {doc?.resultStale && <p className="muted">updating…</p>}
            {r.band?.detected === false && (
              <p className="warnings" data-testid="no-band">
                No rim band found{r.band.reason ? `: ${r.band.reason}` : ''}. Correct the scale or draw the boundary by hand.
              </p>
            )}
            <StatsTable result={r} stale={Boolean(doc?.resultStale)} />
            {Array.isArray(r.warnings) && r.warnings.length > 0 && (
              <ul className="warnings">
                {r.warnings.map((w, i) => (
                  <li key={i}>{String(w)}</li>
                ))}
              </ul>
            )}
            <div className="plot" aria-label="width histogram" dangerouslySetInnerHTML={{ __html: plots.hist }} />
            <div className="plot" aria-label="polar width profile" dangerouslySetInnerHTML={{ __html: plots.polar }} />
          </>
        )}
      </section>
      {m && (
        <section>
          <h2>Material and critical distance</h2>
          <label className="field">
            <span>name</span>
            <input type="text" value={m.name} onChange={(e) => set({ name: e.target.value })} />
          </label>
          <NumField label="toughness K_c" unit="MPa·√m" value={m.toughnessMPaSqrtM} onDone={onMaterialDone} onChange={(v) => type({ toughnessMPaSqrtM: v })} testId="kc" />
          <NumField label="sd of K_c" unit="MPa·√m" value={m.toughnessSdMPaSqrtM} onDone={onMaterialDone} onChange={(v) => type({ toughnessSdMPaSqrtM: v })} />
          <NumField label="inherent strength σ₀" unit="MPa" value={m.strengthMPa} onDone={onMaterialDone} onChange={(v) => type({ strengthMPa: v })} testId="sigma0" />
          <NumField label="sd of σ₀" unit="MPa" value={m.strengthSdMPa} onDone={onMaterialDone} onChange={(v) => type({ strengthSdMPa: v })} />
          <NumField label="strain rate" unit="1/s" value={m.strainRatePerS} onDone={onMaterialDone} onChange={(v) => type({ strainRatePerS: v })} />
          <NumField label="rate law L = A·ε̇^B: A" unit="µm" value={m.rateLawA} onDone={onMaterialDone} onChange={(v) => type({ rateLawA: v })} />
          <NumField label="B" unit="—" value={m.rateLawB} onDone={onMaterialDone} onChange={(v) => type({ rateLawB: v })} />
          <label className="field">
            <span>compare width with</span>
            <select value={m.reference} onChange={(e) => set({ reference: e.target.value as MaterialForm['reference'] })}>
              <option value="L">L</option>
              <option value="L/2">L/2</option>
              <option value="2L">2L</option>
            </select>
          </label>
          <NumField label="tolerance" unit="%" value={m.tolerancePct} onDone={onMaterialDone} onChange={(v) => type({ tolerancePct: v ?? 20 })} />
          <label className="file-button">
            Read a material sheet…
            <input type="file" accept=".json,application/json" onChange={(e) => e.target.files?.[0] && onMaterialFile(e.target.files[0])} />
          </label>
          {r && L && (
            <table className="stats" data-testid="tcd-table">
              <tbody>
                <tr>
                  <th>L = (1/π)(K_c/σ₀)²</th>
                  <td>{f(L.L_um)} µm</td>
                </tr>
                <tr>
                  <th>95 % interval of L</th>
                  <td>{Li ? `${f(Li[0])} … ${f(Li[1])} µm` : '—'}</td>
                </tr>
                {cmp && (
                  <>
                    {typeof cmp.note === 'string' && (
                      <tr>
                        <td colSpan={2} className="muted small">
                          {cmp.note}
                        </td>
                      </tr>
                    )}
                    <tr>
                      <th>width / {String(cmp.reference ?? m.reference)}</th>
                      <td>{f(cmp.ratio, 3)}</td>
                    </tr>
                    <tr>
                      <th>95 % interval of the ratio</th>
                      <td>{ri ? `${f(ri[0], 3)} … ${f(ri[1], 3)}` : '—'}</td>
                    </tr>
                    <tr>
                      <th>verdict</th>
                      <td data-testid="verdict">{String(cmp.verdict ?? '—')}</td>
                    </tr>
                    <tr>
                      <th>implied toughness</th>
                      <td>{typeof impliedVal === 'number' ? `${f(impliedVal, 2)} MPa·√m${impliedCi ? ` (95 %: ${f(impliedCi[0], 2)} … ${f(impliedCi[1], 2)})` : ''}` : '—'}</td>
                    </tr>
                  </>
                )}
              </tbody>
            </table>
          )}
        </section>
      )}
      <section>
        <h2>Save</h2>
        <div className="buttons">
          <button disabled={!r} onClick={() => onExport('json')} data-testid="export-json">Result JSON</button>
          <button disabled={!r} onClick={() => onExport('csv')}>CSV row</button>
          <button disabled={!doc} onClick={() => onExport('png')}>Overlay PNG</button>
          <button disabled={!r} onClick={() => onExport('html')}>HTML report</button>
          <button disabled={!doc} onClick={() => onExport('session')} data-testid="export-session">Save session</button>
          <label className="file-button">
            Reopen session…
            <input type="file" accept=".json,application/json" data-testid="open-session" onChange={(e) => e.target.files?.[0] && onOpenSession(e.target.files[0])} />
          </label>
        </div>
      </section>
      <p className="caution" data-testid="caution">{CAUTION_TEXT}</p>
    </aside>
  );
}
