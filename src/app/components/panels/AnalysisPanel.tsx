/** Analysis settings (all images, or this image's own), "Find boundary", excluded sectors. */
import { Field, NumberField } from '../fields.js';
import { Messages } from '../Messages.js';
import { settingsOf } from '../../state/document.js';
import { ownSettings, setSettings } from '../../state/actions/inputs.js';
import { removeSector } from '../../state/actions/edit.js';
import { textureWindowOf } from '../../flows/measure.js';
import { num, type PanelProps } from './types.js';

export function AnalysisPanel(p: PanelProps) {
  const { doc, series, act } = p;
  const s = settingsOf(doc, series);
  const auto = textureWindowOf(doc);
  return (
    <section>
      <h2>Boundary</h2>
      <label className="field scope">
        <span>settings for</span>
        <select value={doc.settings ? 'own' : 'series'} data-testid="settings-scope" onChange={(e) => act('analysis', (d, se) => ownSettings(d, se, e.target.value === 'own'))}>
          <option value="series">all images</option>
          <option value="own">this image only</option>
        </select>
        <span />
      </label>
      <Field label="texture window" unit="µm" title="Side of the square window the roughness is computed in; empty = automatic (1/25 of the specimen radius)">
        <NumberField value={s.windowUm} placeholder={auto.um !== null ? `auto ${num(auto.um, 3)}` : 'auto'} testId="window-um" onCommit={(v) => act('analysis', (d, se) => setSettings(d, se, { windowUm: v }))} />
      </Field>
      <Field label="rays" title="Number of rays around the circumference">
        <NumberField value={s.nRays} testId="rays" onCommit={(v) => act('analysis', (d, se) => setSettings(d, se, { nRays: v ?? NaN }))} />
      </Field>
      <label className="check">
        <input type="checkbox" checked={s.dropOutliers} onChange={(e) => act('analysis', (d, se) => setSettings(d, se, { dropOutliers: e.target.checked }))} />
        leave outlier rays out of the statistics
      </label>
      <button className="primary" onClick={() => p.flows.findBoundary()} disabled={doc.busy !== null} data-testid="find-boundary">
        {doc.busy === 'analysing' ? 'Measuring…' : doc.base ? 'Find boundary again' : 'Find boundary'}
      </button>
      <Messages doc={doc} area="analysis" />
      {doc.exclude.length > 0 && (
        <ul className="sectors" data-testid="sectors">
          {doc.exclude.map(([a, b], i) => (
            <li key={i}>
              excluded {num(a)}° → {num(b)}°{' '}
              <button className="link" onClick={() => act('edit', (d) => removeSector(d, i))}>
                include again
              </button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
