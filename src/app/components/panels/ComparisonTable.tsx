/** L with its interval (or why it has none), the width/reference ratio, the verdict, the implied K_c. */
import type { MeasureResult } from '../../../core/index.js';
import { num } from './types.js';

function lLabel(basis: NonNullable<MeasureResult['criticalDistance']>['basis']): string {
  if (basis === 'strain-rate law for L') return 'L from the strain-rate law';
  if (basis === 'strain-rate law for σ_0') return 'L = (1/π)(K_c/σ₀(ε̇))²';
  return 'L = (1/π)(K_c/σ₀)²';
}

export function ComparisonTable({ r, stale }: { r: MeasureResult; stale: boolean }) {
  const cd = r.criticalDistance;
  if (!cd) return null;
  const cmp = r.comparison;
  const li = cd.interval95_um;
  const noInterval = cd.basis === 'strain-rate law for L' ? 'none: the rate law carries no scatter' : 'none: give the sd of K_c or σ₀';
  const imp = cmp?.impliedToughness_MPa_sqrtm ?? null;
  return (
    <table className={`stats${stale ? ' stale' : ''}`} data-testid="tcd-table">
      <tbody>
        <tr>
          <th>{lLabel(cd.basis)}</th>
          <td data-testid="l-um" data-value={String(cd.L_um)}>
            {num(cd.L_um)} µm
          </td>
        </tr>
        <tr>
          <th>95 % interval of L</th>
          <td>{li ? `${num(li[0])} – ${num(li[1])} µm` : noInterval}</td>
        </tr>
        {cmp ? (
          <>
            <tr>
              <th>width / {cmp.reference}</th>
              <td>
                {num(cmp.ratio, 3)} <span className="muted">(95 %: {num(cmp.ratioInterval95[0], 3)} – {num(cmp.ratioInterval95[1], 3)})</span>
              </td>
            </tr>
            <tr>
              <th>verdict (±{num(cmp.tolerancePct, 3)} %)</th>
              <td data-testid="verdict" className={`verdict ${cmp.verdict}`}>
                {cmp.verdict}
              </td>
            </tr>
            <tr>
              <td colSpan={2} className="note">
                {cmp.note}
              </td>
            </tr>
            <tr>
              <th>toughness implied by the width</th>
              <td>
                {imp ? `${num(imp.K_MPa_sqrtm)} MPa·√m` : '—'}
                {imp?.interval95_MPa_sqrtm && (
                  <span className="muted">
                    {' '}
                    (95 %: {num(imp.interval95_MPa_sqrtm[0])} – {num(imp.interval95_MPa_sqrtm[1])})
                  </span>
                )}
              </td>
            </tr>
          </>
        ) : (
          <tr>
            <td colSpan={2} className="note">
              No comparison: no band width was measured.
            </td>
          </tr>
        )}
      </tbody>
    </table>
  );
}
