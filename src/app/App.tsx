/**
 * The web app shell: images and inputs on the left, the image with its edit tools in the middle,
 * results, material and saving on the right. State lives in src/app/state (pure documents,
 * actions, histories); flows talk to the engine worker; this file only lays the parts out.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import { CAUTION, type PointPx } from '../core/index.js';
import { activeDoc, setView, type AppState } from './state/store.js';
import { apply, type Change } from './state/actions/types.js';
import { setTwoPointScale } from './state/actions/scale.js';
import { settingsOf, type Doc, type MessageArea, type Series } from './state/document.js';
import { scaleOf, umPerPxOf } from './state/scale.js';
import { defaultLabelRadiusPx } from './state/labels.js';
import { useStore, type Update } from './hooks/useStore.js';
import { useEngine } from './hooks/useEngine.js';
import { useRecompute } from './hooks/useRecompute.js';
import { useKeyboard } from './hooks/useKeyboard.js';
import { useFlows, type AppFlows } from './hooks/useFlows.js';
import type { Act } from './components/panels/types.js';
import { ImagesPanel } from './components/panels/ImagesPanel.js';
import { ScalePanel } from './components/panels/ScalePanel.js';
import { AnalysisPanel } from './components/panels/AnalysisPanel.js';
import { TexturePanel } from './components/panels/TexturePanel.js';
import { Plots, ResultsPanel } from './components/panels/ResultsPanel.js';
import { MaterialPanel } from './components/panels/MaterialPanel.js';
import { SavePanel } from './components/panels/SavePanel.js';
import { TeachPanel } from './components/panels/TeachPanel.js';
import { Toolbar } from './components/Toolbar.js';
import { HelpDialog } from './components/HelpDialog.js';
import { ImageView } from './components/view/ImageView.js';
import { Messages } from './components/Messages.js';

/** Size of the element, kept up to date. */
function useSize(): [React.RefObject<HTMLDivElement | null>, { w: number; h: number }] {
  const ref = useRef<HTMLDivElement | null>(null);
  const [size, setSize] = useState({ w: 800, h: 600 });
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setSize({ w: Math.max(200, el.clientWidth), h: Math.max(200, el.clientHeight) }));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, size];
}

function brushRadiusPx(state: AppState, doc: Doc): number {
  const u = umPerPxOf(doc);
  return state.view.brushRadiusUm > 0 && u ? state.view.brushRadiusUm / u : Math.max(4, Math.min(doc.image.widthPx, doc.image.heightPx) / 40);
}

/** Teach-brush radius (px): typed in µm, else 1/150 of the smaller image side. */
function labelRadiusPx(state: AppState, doc: Doc): number {
  const u = umPerPxOf(doc);
  return state.view.teach.radiusUm > 0 && u ? state.view.teach.radiusUm / u : defaultLabelRadiusPx(doc.image.widthPx, doc.image.heightPx);
}

function Centre(p: { state: AppState; doc: Doc | null; update: Update; act: Act; flows: AppFlows; lineUm: number | null }) {
  const [ref, size] = useSize();
  const { state, doc } = p;
  const scale = doc ? scaleOf(doc) : null;
  const texture = doc ? p.flows.textures[doc.id] : undefined;
  const onScaleLine = (p0: PointPx, p1: PointPx) => p.act('scale', () => setTwoPointScale(p0, p1, p.lineUm));
  return (
    <main className="centre">
      <Toolbar state={state} doc={doc} update={p.update} act={p.act} />
      {doc && (
        <div className="edit-messages">
          <Messages doc={doc} area="edit" />
        </div>
      )}
      <div ref={ref} className="stage-area">
        {doc && p.flows.previews[doc.id] ? (
          <ImageView
            doc={doc}
            tool={state.view.tool}
            image={p.flows.previews[doc.id]}
            texture={texture ? { canvas: texture.canvas, opacity: state.view.texture.opacity } : null}
            width={size.w}
            height={size.h - 26}
            brushRadiusPx={brushRadiusPx(state, doc)}
            labelRadiusPx={labelRadiusPx(state, doc)}
            teach={state.view.teach.on ? { classMap: p.flows.teach.model && p.flows.teach.maps[doc.id]?.sha256 === p.flows.teach.model.sha256 ? p.flows.teach.maps[doc.id].canvas : null, opacity: state.view.teach.opacity } : null}
            nRays={settingsOf(doc, state.series).nRays}
            pitch={scale?.ok ? { x: scale.scale.umPerPxX, y: scale.scale.umPerPxY } : null}
            act={(c) => p.act('edit', () => c)}
            onScaleLine={onScaleLine}
          />
        ) : (
          <div className="empty">Open a fractograph (PNG, JPEG or TIFF, 8 or 16 bit) or drop it here.</div>
        )}
      </div>
    </main>
  );
}

export function App() {
  const store = useStore();
  const { state, update } = store;
  const eng = useEngine();
  const flows = useFlows(eng.engine, store, eng.done);
  const [dragOver, setDragOver] = useState(false);
  const [lineUm, setLineUm] = useState<number | null>(null);
  useRecompute(eng.engine, eng.ready, state, update);
  useKeyboard(update);
  const doc = activeDoc(state);

  const sampleTried = useRef(false);
  useEffect(() => {
    if (!eng.ready || sampleTried.current) return;
    sampleTried.current = true;
    flows.openSample();
  }, [eng.ready, flows]);

  const act = useCallback<Act>(
    (area: MessageArea, f: (d: Doc, s: Series) => Change) =>
      update((s) => {
        const d = activeDoc(s);
        return d ? apply(s, d.id, f(d, s.series), area) : s;
      }),
    [update],
  );
  const panel = doc ? { doc, series: state.series, act, flows: flows.forDoc(doc.id) } : null;
  return (
    <div
      className={`app${dragOver ? ' drag-over' : ''}`}
      onDragOver={(e) => {
        e.preventDefault();
        setDragOver(true);
      }}
      onDragLeave={() => setDragOver(false)}
      onDrop={(e) => {
        e.preventDefault();
        setDragOver(false);
        flows.openFiles(Array.from(e.dataTransfer.files));
      }}
    >
      <header>
        <strong>fractozone</strong>
        <span className="muted">rim band width of notched bars, compared with the critical distance</span>
        <span className="spacer" />
        {eng.progress && (
          <span className="progress" data-testid="progress">
            {eng.progress.stage} <progress max={1} value={eng.progress.fraction} />
          </span>
        )}
        <span data-testid="engine-status" className="status">
          {eng.status}
        </span>
        <button onClick={() => update((s) => setView(s, { showHelp: true }))} title="Keyboard shortcuts (?)">
          Shortcuts
        </button>
      </header>
      <nav className="left">
        <ImagesPanel state={state} update={update} onOpen={flows.openFiles} onClose={flows.forget} />
        {panel && <ScalePanel key={`scale-${panel.doc.id}`} {...panel} lineUm={lineUm} onDrawLine={(v) => (setLineUm(v), update((s) => setView(s, { tool: 'scale-line' })))} />}
        {panel && <AnalysisPanel key={`analysis-${panel.doc.id}`} {...panel} />}
        {panel && <TeachPanel state={state} doc={panel.doc} update={update} flows={flows} />}
        {panel && <TexturePanel key={`texture-${panel.doc.id}`} {...panel} view={state.view} update={update} shown={flows.textures[panel.doc.id]?.label ?? null} />}
      </nav>
      <Centre state={state} doc={doc} update={update} act={act} flows={flows} lineUm={lineUm} />
      <aside className="right">
        {panel ? (
          <>
            <ResultsPanel key={`results-${panel.doc.id}`} {...panel} />
            <MaterialPanel key={`material-${panel.doc.id}`} {...panel} />
            <SavePanel key={`save-${panel.doc.id}`} {...panel} />
            {panel.doc.result && <Plots r={panel.doc.result} />}
          </>
        ) : (
          <p className="muted">Open an image to measure it.</p>
        )}
        <p className="caution" data-testid="caution">
          {CAUTION}
        </p>
      </aside>
      {state.view.showHelp && <HelpDialog onClose={() => update((s) => setView(s, { showHelp: false }))} />}
    </div>
  );
}
