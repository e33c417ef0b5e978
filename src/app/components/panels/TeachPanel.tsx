/**
 * Teach by example: paint a few strokes of each class (outside the fracture surface, rim band,
 * core) on one or more images; a pixel model is taught from them in the engine and its class map
 * is shown over the image. The model can be saved (fractozone.model/1, the command line's
 * `--model` file), opened again, and used to measure every open image.
 */
import type { AppFlows } from '../../hooks/useFlows.js';
import type { Update } from '../../hooks/useStore.js';
import type { AppState } from '../../state/store.js';
import { setView } from '../../state/store.js';
import type { Doc, LabelClass } from '../../state/document.js';
import { LABEL_COLOURS, LABEL_NAMES, missingClasses } from '../../state/labels.js';
import { teachInputs } from '../../flows/teach.js';
import { FileButton } from '../fields.js';
import { Messages } from '../Messages.js';
import { num } from './types.js';

const secs = (ms: number): string => `${(ms / 1000).toFixed(2)} s`;

function ClassCounts({ docs }: { docs: Doc[] }) {
  return (
    <div className="teach-classes">
      {([1, 2, 3] as LabelClass[]).map((c) => {
        const n = docs.reduce((k, d) => k + d.labels.filter((s) => s.cls === c).length, 0);
        const [r, g, b] = LABEL_COLOURS[c];
        return (
          <span key={c} className={n ? '' : 'muted'} data-testid={`strokes-${c}`} data-count={n}>
            <i className="swatch" style={{ background: `rgb(${r},${g},${b})` }} />
            {LABEL_NAMES[c]} {n}
          </span>
        );
      })}
    </div>
  );
}

export function TeachPanel({ state, doc, update, flows }: { state: AppState; doc: Doc; update: Update; flows: AppFlows }) {
  const t = flows.teach;
  const on = state.view.teach.on;
  const missing = missingClasses(state.docs);
  const map = t.model ? t.maps[doc.id] : undefined;
  const inUse = state.series.model;
  const setTeachView = (v: Partial<AppState['view']['teach']>) => update((s) => setView(s, { teach: { ...s.view.teach, ...v } }));
  const unscaled = on ? teachInputs(state).unscaled : [];
  let status: string;
  if (unscaled.length > 0) status = `Set the scale of ${unscaled.join(', ')} first: the model learns sizes in µm.`;
  else if (t.busy === 'teaching') status = 'Teaching…';
  else if (t.busy === 'mapping') status = 'Computing the class map…';
  else if (t.busy === 'preparing') status = 'Preparing the image for teaching (working copy and features)…';
  else if (on && missing.length > 0 && !t.model) status = `Paint a few strokes of each class: ${missing.map((c) => LABEL_NAMES[c].toLowerCase()).join(', ')} still missing.`;
  else if (map && map.sha256 === t.model?.sha256) {
    const grid = map.stride > 1 ? `; a preview: the model is evaluated at points ${map.stride} px apart on the ${map.canvas.width} × ${map.canvas.height} working copy and interpolated between — measuring evaluates it more finely` : '';
    status = `Class map shown (${map.totalMs !== null ? `${secs(map.totalMs)} from the stroke, class map ${secs(map.mapMs)}` : secs(map.mapMs)}${grid}).`;
  }
  else status = on ? '' : 'Paint what outside, rim band and core look like; a model learns them and can measure the whole series.';
  return (
    <section data-testid="teach-panel">
      <h2>Teach by example</h2>
      <div className="row">
        <button
          className={on ? 'on' : ''}
          aria-pressed={on}
          data-testid="teach-toggle"
          title={on ? 'Leave teach mode (the strokes and the model stay)' : 'Paint strokes of each class; a model learns from them'}
          onClick={() => update((s) => setView(s, { teach: { ...s.view.teach, on: !on }, tool: on ? 'vertex' : 'teach-outside' }))}
        >
          Teach
        </button>
        <FileButton label="Open model…" accept=".json,application/json" testId="model-input" onFiles={(f) => flows.openModel(f[0])} />
      </div>
      {on && <ClassCounts docs={state.docs} />}
      {status && (
        <p className="hint" data-testid="teach-status" data-busy={t.busy ?? ''}>
          {status}
        </p>
      )}
      {t.model && (
        <>
          <p className="hint" data-testid="model-shown" data-sha256={t.model.sha256} data-map-ms={map?.mapMs ?? ''} data-map-sha256={map?.sha256 ?? ''} data-map-stride={map?.stride ?? ''} data-total-ms={map?.totalMs ?? ''} data-fractions={map ? map.fractions.map((f) => f.toFixed(4)).join(' ') : ''}>
            Model {t.model.name}: out-of-bag accuracy {num(100 * t.model.training.oobAccuracy, 3)} %, {t.model.training.nTrees} trees, windows{' '}
            {t.model.windowsUm.map((w) => num(w, 3)).join(' / ')} µm; SHA-256 {t.model.sha256.slice(0, 12)}…
          </p>
          {on && (
            <div className="row">
              <span className="hint">class map</span>
              <input type="range" min={0} max={1} step={0.05} value={state.view.teach.opacity} aria-label="opacity of the class map" onChange={(e) => setTeachView({ opacity: Number(e.target.value) })} />
            </div>
          )}
          <div className="row">
            <button onClick={() => flows.saveModel()} data-testid="save-model" title="Save the model file (fractozone.model/1; the command line reads it with --model)">
              Save model
            </button>
            <button onClick={() => flows.applyModel(true)} data-testid="apply-model" disabled={inUse?.sha256 === t.model.sha256} title="Measure every open image with this model">
              Apply to all
            </button>
          </div>
        </>
      )}
      {inUse && (
        <div className="row">
          <span className="hint" data-testid="model-in-use" data-sha256={inUse.sha256}>
            Images are measured with the model {inUse.name}.
          </span>
          <button onClick={() => flows.applyModel(false)} data-testid="drop-model" title="Measure every open image with the fixed rules again">
            Without model
          </button>
        </div>
      )}
      {t.error && (
        <p className="error" data-testid="teach-error">
          {t.error}
        </p>
      )}
      <Messages doc={doc} area="teach" />
    </section>
  );
}
