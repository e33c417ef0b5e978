/**
 * The web app shell: image list and tools on the left, the image in the middle, results on the
 * right. State lives in src/app/state (pure); this component wires it to the engine worker and the
 * panels. All processing runs in the worker; nothing leaves the browser.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type Konva from 'konva';
import type { PointPx } from '../core/pipeline/types.js';
import { parseMaterialSheet } from '../core/tcd/materials.js';
import { createEngine, type Engine } from './worker/client.js';
import type { EngineCapabilities } from './worker/protocol.js';
import { describeScale, fmtNum, newDoc, umPerPxOf, type Doc, type MaterialForm, type ScaleChoice } from './state/document.js';
import { outlineFromPolygon, paramsOf } from './state/params.js';
import { activeDoc, addDoc, canRedo, canUndo, edit, endDrag, initialState, needsRemeasure, setView, type AppState, type DocPatch, type Tool } from './state/store.js';
import { COMMANDS, commandForKey, run } from './state/commands.js';
import { createRemeasurer } from './state/remeasure.js';
import { ImageView } from './components/ImageView.js';
import { Results } from './components/Results.js';
import { download, parseSession, reportHtml, resultCsvText, resultJsonText, sessionText } from './exports.js';

const TOOLS: { tool: Tool; label: string; key: string }[] = [
  { tool: 'pan', label: 'Pan', key: 'H' },
  { tool: 'vertex', label: 'Move points', key: 'V' },
  { tool: 'add-vertex', label: 'Add point', key: 'A' },
  { tool: 'remove-vertex', label: 'Remove point', key: 'X' },
  { tool: 'brush-add', label: 'Paint rim', key: 'B' },
  { tool: 'brush-remove', label: 'Paint core', key: 'E' },
  { tool: 'sector', label: 'Exclude sector', key: 'S' },
  { tool: 'outline', label: 'Outline', key: 'O' },
  { tool: 'scale-line', label: 'Scale line', key: 'L' },
];

const FEATURES = ['localStd', 'localEntropy', 'gradientEnergy'];

function rgbaCanvas(w: number, h: number, rgba: Uint8ClampedArray): HTMLCanvasElement {
  const c = document.createElement('canvas');
  c.width = w;
  c.height = h;
  c.getContext('2d')!.putImageData(new ImageData(new Uint8ClampedArray(rgba.buffer as ArrayBuffer, rgba.byteOffset, rgba.length), w, h), 0, 0);
  return c;
}

/** Texture map → canvas with a dark-blue → yellow ramp (monotone in lightness). */
function overlayCanvas(w: number, h: number, values: Uint8Array): HTMLCanvasElement {
  const rgba = new Uint8ClampedArray(w * h * 4);
  for (let i = 0; i < values.length; i++) {
    const t = values[i] / 255;
    rgba[4 * i] = 255 * Math.min(1, 1.6 * t);
    rgba[4 * i + 1] = 255 * t * t;
    rgba[4 * i + 2] = 255 * (0.55 - 0.5 * t);
    rgba[4 * i + 3] = 255;
  }
  return rgbaCanvas(w, h, rgba);
}

let docCounter = 0;

/** The app: tool column, image view, results column, help overlay; engine in a worker. */
export function App() {
  const [state, setState] = useState<AppState>(initialState);
  const stateRef = useRef(state);
  stateRef.current = state;
  const engineRef = useRef<Engine | null>(null);
  const [caps, setCaps] = useState<EngineCapabilities | null>(null);
  const [status, setStatus] = useState('starting the engine…');
  const [progress, setProgress] = useState<{ stage: string; fraction: number } | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [images, setImages] = useState<Record<string, HTMLCanvasElement>>({});
  const [overlay, setOverlay] = useState<{ docId: string; canvas: HTMLCanvasElement; label: string } | null>(null);
  const [pointer, setPointer] = useState<PointPx | null>(null);
  const [dragOver, setDragOver] = useState(false);
  const stageRef = useRef<Konva.Stage | null>(null);
  const centreRef = useRef<HTMLDivElement | null>(null);
  const [viewSize, setViewSize] = useState({ w: 800, h: 600 });
  const [typedUm, setTypedUm] = useState('');
  const [barUm, setBarUm] = useState('');
  const [lineUm, setLineUm] = useState('');
  const [pendingLine, setPendingLine] = useState<[PointPx, PointPx] | null>(null);

  const doc = activeDoc(state);
  const update = useCallback((fn: (s: AppState) => AppState) => setState((s) => fn(s)), []);

  // engine
  useEffect(() => {
    const engine = createEngine((stage, fraction) => setProgress({ stage, fraction }));
    engineRef.current = engine;
    let alive = true;
    engine.request({ type: 'status' }).then((s) => alive && setCaps(s.capabilities));
    engine
      .request({ type: 'cvSelfTest' })
      .then((r) => {
        if (!alive) return;
        const ok = r.output.length === 9 && r.output.every((v) => Math.abs(v - 1) < 1e-6);
        setStatus(ok ? 'engine ready (OpenCV self-test passed)' : 'engine self-test FAILED');
        setProgress(null);
      })
      .catch((e: Error) => alive && setStatus(`engine failed: ${e.message}`));
    return () => {
      alive = false;
      engine.terminate();
    };
  }, []);

  // layout size of the centre
  useEffect(() => {
    const el = centreRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setViewSize({ w: Math.max(200, el.clientWidth), h: Math.max(200, el.clientHeight - 28) }));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  const remeasurer = useMemo(
    () =>
      createRemeasurer(
        (req) => engineRef.current!.request({ type: 'remeasure', docId: req.docId, params: req.params, geometry: req.geometry }),
        (docId, result) => update((s) => edit(s, docId, { result, resultStale: false }, 'silent')),
        (docId, e) => {
          setMessage(e.message);
          update((s) => edit(s, docId, { resultStale: false }, 'silent'));
        },
      ),
    [update],
  );

  // every edit of the measured geometry → fast re-measure (no re-segmentation)
  const prevDocs = useRef<Map<string, Doc>>(new Map());
  useEffect(() => {
    const prev = prevDocs.current;
    for (const d of state.docs) {
      const before = prev.get(d.id);
      if (before && before !== d && before.status === 'analysed' && d.status === 'analysed' && needsRemeasure(before, d)) {
        if (!d.resultStale) update((s) => edit(s, d.id, { resultStale: true }, 'silent'));
        void remeasurer.request(d);
      }
    }
    prevDocs.current = new Map(state.docs.map((d) => [d.id, d]));
  }, [state.docs, remeasurer, update]);

  const onEdit = useCallback(
    (patch: DocPatch, mode: 'commit' | 'transient' | 'end', label: string) => {
      const id = stateRef.current.activeId;
      if (id) update((s) => edit(s, id, patch, mode, label));
    },
    [update],
  );

  // opening files
  const openBytes = useCallback(
    async (name: string, bytes: ArrayBuffer) => {
      const engine = engineRef.current;
      if (!engine) return;
      const docId = `doc${++docCounter}`;
      setMessage(null);
      try {
        const img = await engine.request({ type: 'open', docId, name, bytes }, undefined, [bytes]);
        const canvas = rgbaCanvas(img.widthPx, img.heightPx, img.rgba);
        setImages((m) => ({ ...m, [docId]: canvas }));
        const d = newDoc({ id: docId, name, sha256: img.sha256, widthPx: img.widthPx, heightPx: img.heightPx, format: img.format, bitDepth: img.bitDepth, metadataUmPerPx: img.metadataUmPerPx });
        update((s) => addDoc(s, d));
      } catch (e) {
        setMessage(`${name}: ${(e as Error).message}`);
      } finally {
        setProgress(null);
      }
    },
    [update],
  );

  const openFiles = useCallback(
    async (files: FileList | File[]) => {
      for (const f of Array.from(files)) await openBytes(f.name, await f.arrayBuffer());
    },
    [openBytes],
  );

  // bundled invented sample, opened at start
  const sampleTried = useRef(false);
  useEffect(() => {
    if (sampleTried.current || !caps) return;
    sampleTried.current = true;
    (async () => {
      try {
        const info = (await (await fetch('sample/sample.json')).json()) as { file: string | null };
        if (info.file) {
          const bytes = await (await fetch(info.file)).arrayBuffer();
          await openBytes(info.file.split('/').pop() ?? 'sample', bytes);
          return;
        }
      } catch {
        /* no bundled sample: draw one */
      }
      if (caps.render) {
        const s = await engineRef.current!.request({ type: 'renderSample', seed: 1 });
        await openBytes(s.name, s.bytes);
      }
    })().catch((e: Error) => setMessage(`sample: ${e.message}`));
  }, [caps, openBytes]);

  // keyboard
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'SELECT' || t.tagName === 'TEXTAREA')) return;
      const c = commandForKey(e);
      if (c) {
        e.preventDefault();
        update((s) => c.perform(s));
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [update]);

  // analysis
  const analyse = useCallback(async () => {
    const d = activeDoc(stateRef.current);
    if (!d) return;
    setMessage(null);
    update((s) => edit(s, d.id, { status: 'analysing' }, 'silent'));
    try {
      const out = await engineRef.current!.request({ type: 'analyse', docId: d.id, params: paramsOf(d, { withBoundary: false }) });
      const g = out.geometry;
      update((s) =>
        edit(
          s,
          d.id,
          {
            result: out.result,
            outerPolygon: g.outerPolygon.length >= 3 ? g.outerPolygon : null,
            outline: outlineFromPolygon(g.outerPolygon),
            outlineEdited: false,
            boundary: g.boundaryPolygon.length >= 3 ? g.boundaryPolygon : null,
            boundaryEdited: false,
            status: 'analysed',
            resultStale: false,
            error: null,
          },
          'commit',
          'find boundary',
        ),
      );
    } catch (e) {
      setMessage((e as Error).message);
      update((s) => edit(s, d.id, { status: 'error', error: (e as Error).message }, 'silent'));
    } finally {
      setProgress(null);
    }
  }, [update]);

  const detectBar = useCallback(async () => {
    const d = activeDoc(stateRef.current);
    if (!d) return;
    setMessage(null);
    try {
      const bar = await engineRef.current!.request({ type: 'detectBar', docId: d.id });
      if (!bar) {
        setMessage('No scale bar found: draw a line along it (tool “Scale line”) or type the pixel size.');
        return;
      }
      const len = Number(barUm) || (d.scale.source === 'scale-bar' ? d.scale.barLengthUm : 0);
      if (!(len > 0)) {
        setMessage(`Scale bar found (${fmtNum(bar.lengthPx)} px): type its length in µm and press “Use bar”.`);
      }
      update((s) => edit(s, d.id, { scale: { source: 'scale-bar', bar, barLengthUm: len > 0 ? len : 0 } }, 'commit', 'scale bar'));
    } catch (e) {
      setMessage((e as Error).message);
    } finally {
      setProgress(null);
    }
  }, [barUm, update]);

  const setScale = (sc: ScaleChoice, label: string) => doc && update((s) => edit(s, doc.id, { scale: sc }, 'commit', label));

  const showTexture = useCallback(
    async (feature: string) => {
      const d = activeDoc(stateRef.current);
      if (!d) return;
      const ump = umPerPxOf(d);
      const v = stateRef.current.view;
      const windowUm = v.overlayWindowUm > 0 ? v.overlayWindowUm : null;
      const windowPx = windowUm && ump ? windowUm / ump : Math.max(7, Math.round(Math.min(d.widthPx, d.heightPx) / 60));
      try {
        const t = await engineRef.current!.request({ type: 'texture', docId: d.id, feature, windowPx });
        setOverlay({ docId: d.id, canvas: overlayCanvas(t.width, t.height, t.values), label: `${feature}, window ${fmtNum(windowPx)} px` });
      } catch (e) {
        setMessage((e as Error).message);
      } finally {
        setProgress(null);
      }
    },
    [],
  );

  const onExport = useCallback(
    (kind: 'json' | 'csv' | 'png' | 'html' | 'session') => {
      const d = activeDoc(stateRef.current);
      if (!d) return;
      const stem = d.name.replace(/\.[^.]+$/, '');
      const png = () => stageRef.current?.toDataURL({ pixelRatio: 1 }) ?? null;
      if (kind === 'json' && d.result) download(`${stem}.result.json`, resultJsonText(d.result), 'application/json');
      if (kind === 'csv' && d.result) download(`${stem}.csv`, resultCsvText(d), 'text/csv');
      if (kind === 'session') download(`${stem}.session.json`, sessionText(d), 'application/json');
      if (kind === 'html' && d.result) download(`${stem}.report.html`, reportHtml(d, png()), 'text/html');
      if (kind === 'png') {
        const url = png();
        if (url) fetch(url).then((r) => r.blob()).then((b) => download(`${stem}.overlay.png`, b));
      }
    },
    [],
  );

  const onOpenSession = useCallback(
    async (file: File) => {
      const d = activeDoc(stateRef.current);
      if (!d) return;
      try {
        const patch = parseSession(await file.text(), d);
        update((s) => edit(s, d.id, patch, 'commit', 'reopen session'));
        if (patch.boundary && d.status !== 'analysed') {
          // the engine needs its artifacts (outline, scale) once; then the session boundary is re-measured
          await analyse();
          update((s) => edit(s, d.id, { ...patch }, 'silent'));
        }
      } catch (e) {
        setMessage((e as Error).message);
      }
    },
    [update, analyse],
  );

  const onMaterialFile = useCallback(
    async (file: File) => {
      const d = activeDoc(stateRef.current);
      if (!d) return;
      try {
        const mats = parseMaterialSheet(await file.text(), file.name);
        const m = mats[0];
        const next: MaterialForm = {
          ...d.material,
          name: m.name,
          sheet: m,
          toughnessMPaSqrtM: m.fractureToughness.value,
          toughnessSdMPaSqrtM: m.fractureToughness.sd ?? null,
          strengthMPa: m.inherentStrength.value,
          strengthSdMPa: m.inherentStrength.sd ?? null,
        };
        update((s) => edit(s, d.id, { material: next }, 'commit', 'material sheet'));
        if (mats.length > 1) setMessage(`${file.name}: ${mats.length} materials, using the first (“${m.name}”).`);
      } catch (e) {
        setMessage((e as Error).message);
      }
    },
    [update],
  );

  const ump = doc ? umPerPxOf(doc) : null;
  const brushRadiusPx = doc ? (state.view.brushRadiusUm > 0 && ump ? state.view.brushRadiusUm / ump : Math.max(4, Math.min(doc.widthPx, doc.heightPx) / 40)) : 10;
  const busy = progress !== null;

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
        if (e.dataTransfer.files.length) void openFiles(e.dataTransfer.files);
      }}
    >
      <header>
        <strong>fractozone</strong>
        <span className="muted">rim band width of notched bars, compared with the critical distance</span>
        <span className="spacer" />
        <span data-testid="engine-status" className="status">
          {status}
        </span>
        {progress && (
          <span className="progress" data-testid="progress">
            {progress.stage} <progress max={1} value={progress.fraction} />
          </span>
        )}
        <button onClick={() => update((s) => setView(s, { showHelp: true }))} title="Keyboard shortcuts (?)">
          Shortcuts
        </button>
      </header>
      <nav className="tools">
        <section>
          <h2>Images</h2>
          <label className="file-button">
            Open images…
            <input type="file" multiple accept=".png,.jpg,.jpeg,.tif,.tiff,image/*" data-testid="file-input" onChange={(e) => e.target.files && void openFiles(e.target.files)} />
          </label>
          <p className="muted small">or drop files on the window</p>
          <ul className="doc-list" data-testid="doc-list">
            {state.docs.map((d) => (
              <li key={d.id} className={d.id === state.activeId ? 'active' : ''}>
                <button onClick={() => update((s) => ({ ...s, activeId: d.id }))}>
                  {d.name} <span className="muted">{d.widthPx}×{d.heightPx} px{d.bitDepth === 16 ? ', 16-bit' : ''}</span>
                </button>
              </li>
            ))}
          </ul>
        </section>
        {doc && (
          <section>
            <h2>Scale</h2>
            <p className="scale-active" data-testid="scale-source">
              {describeScale(doc)}
            </p>
            <div className="row">
              <input type="number" step="any" placeholder="bar length" value={barUm} onChange={(e) => setBarUm(e.target.value)} data-testid="bar-um" />
              <span className="unit">µm</span>
              <button onClick={() => void detectBar()} disabled={busy} data-testid="find-bar">
                Find bar
              </button>
            </div>
            {doc.scale.source === 'scale-bar' && doc.scale.bar && (
              <button onClick={() => Number(barUm) > 0 && doc.scale.source === 'scale-bar' && setScale({ ...doc.scale, barLengthUm: Number(barUm) }, 'bar length')}>Use bar</button>
            )}
            <div className="row">
              <input type="number" step="any" placeholder="pixel size" value={typedUm} onChange={(e) => setTypedUm(e.target.value)} data-testid="typed-um" />
              <span className="unit">µm/px</span>
              <button onClick={() => Number(typedUm) > 0 && setScale({ source: 'typed', umPerPx: Number(typedUm) }, 'typed pixel size')}>Set</button>
            </div>
            <div className="row">
              <input type="number" step="any" placeholder="line length" value={lineUm} onChange={(e) => setLineUm(e.target.value)} />
              <span className="unit">µm</span>
              <button
                onClick={() => {
                  update((s) => setView(s, { tool: 'scale-line' }));
                }}
                title="Drag a line along the scale bar, then type its length"
              >
                Draw line
              </button>
            </div>
            {pendingLine && (
              <button
                onClick={() => {
                  if (Number(lineUm) > 0) {
                    setScale({ source: 'two-point', p0: pendingLine[0], p1: pendingLine[1], distanceUm: Number(lineUm) }, 'scale line');
                    setPendingLine(null);
                  } else setMessage('Type the real length of the line in µm first.');
                }}
              >
                Use line ({fmtNum(Math.hypot(pendingLine[1].x - pendingLine[0].x, pendingLine[1].y - pendingLine[0].y))} px)
              </button>
            )}
            {doc.metadataUmPerPx && doc.scale.source !== 'metadata' && (
              <button onClick={() => setScale({ source: 'metadata', umPerPx: doc.metadataUmPerPx! }, 'metadata scale')}>Use file metadata ({fmtNum(doc.metadataUmPerPx)} µm/px)</button>
            )}
          </section>
        )}
        {doc && (
          <section>
            <h2>Analysis</h2>
            <label className="field">
              <span>texture window</span>
              <input
                type="number"
                step="any"
                placeholder="auto"
                value={doc.settings.windowUm ?? ''}
                onChange={(e) => update((s) => edit(s, doc.id, { settings: { ...doc.settings, windowUm: e.target.value === '' ? null : Number(e.target.value) } }, 'commit', 'window'))}
              />
              <span className="unit">µm</span>
            </label>
            <label className="field">
              <span>rays</span>
              <input type="number" min={8} step={1} value={doc.settings.nRays} onChange={(e) => update((s) => edit(s, doc.id, { settings: { ...doc.settings, nRays: Math.max(8, Math.round(Number(e.target.value) || 360)) } }, 'commit', 'rays'))} />
            </label>
            <label className="check">
              <input type="checkbox" checked={doc.settings.dropOutliers} onChange={(e) => update((s) => edit(s, doc.id, { settings: { ...doc.settings, dropOutliers: e.target.checked } }, 'commit', 'outliers'))} />
              drop outlier rays from the statistics
            </label>
            <button className="primary" onClick={() => void analyse()} disabled={busy || !caps?.pipeline} data-testid="analyse" title={caps?.pipeline ? '' : 'analysis engine not in this build yet'}>
              {doc.status === 'analysing' ? 'Finding…' : 'Find boundary'}
            </button>
            {doc.exclude.length > 0 && (
              <ul className="sectors">
                {doc.exclude.map(([a, b], i) => (
                  <li key={i}>
                    excluded {fmtNum(a)}° → {fmtNum(b)}°{' '}
                    <button onClick={() => update((s) => edit(s, doc.id, { exclude: doc.exclude.filter((_, k) => k !== i) }, 'commit', 'remove sector'))}>remove</button>
                  </li>
                ))}
              </ul>
            )}
          </section>
        )}
        {doc && (
          <section>
            <h2>Edit</h2>
            <div className="toolgrid">
              {TOOLS.map((t) => (
                <button key={t.tool} className={state.view.tool === t.tool ? 'on' : ''} onClick={() => update((s) => setView(s, { tool: t.tool }))} title={`${t.label} (${t.key})`} data-testid={`tool-${t.tool}`}>
                  {t.label}
                </button>
              ))}
            </div>
            <label className="field">
              <span>brush radius</span>
              <input type="number" step="any" placeholder="auto" value={state.view.brushRadiusUm || ''} onChange={(e) => update((s) => setView(s, { brushRadiusUm: Number(e.target.value) || 0 }))} />
              <span className="unit">µm</span>
            </label>
            <div className="row">
              <button disabled={!canUndo(state)} onClick={() => update((s) => run(s, 'undo'))} data-testid="undo">
                Undo
              </button>
              <button disabled={!canRedo(state)} onClick={() => update((s) => run(s, 'redo'))} data-testid="redo">
                Redo
              </button>
            </div>
          </section>
        )}
        {doc && (
          <section>
            <h2>Texture map</h2>
            <select value={state.view.overlayFeature ?? ''} onChange={(e) => update((s) => setView(s, { overlayFeature: e.target.value || null }))}>
              <option value="">(none)</option>
              {FEATURES.map((f) => (
                <option key={f} value={f}>
                  {f}
                </option>
              ))}
            </select>
            <label className="field">
              <span>window</span>
              <input type="number" step="any" placeholder="auto" value={state.view.overlayWindowUm || ''} onChange={(e) => update((s) => setView(s, { overlayWindowUm: Number(e.target.value) || 0 }))} />
              <span className="unit">µm</span>
            </label>
            <label className="field">
              <span>opacity</span>
              <input type="range" min={0} max={1} step={0.05} value={state.view.overlayOpacity} onChange={(e) => update((s) => setView(s, { overlayOpacity: Number(e.target.value) }))} />
            </label>
            <button disabled={!state.view.overlayFeature || busy} onClick={() => state.view.overlayFeature && void showTexture(state.view.overlayFeature)}>
              Show map
            </button>
            {overlay && overlay.docId === doc.id && (
              <p className="muted small">
                {overlay.label} <button onClick={() => setOverlay(null)}>hide</button>
              </p>
            )}
          </section>
        )}
      </nav>
      <main ref={centreRef} className="centre">
        {doc && images[doc.id] ? (
          <ImageView
            doc={doc}
            image={images[doc.id]}
            overlay={overlay && overlay.docId === doc.id ? overlay.canvas : null}
            overlayOpacity={state.view.overlayOpacity}
            tool={state.view.tool}
            brushRadiusPx={brushRadiusPx}
            width={viewSize.w}
            height={viewSize.h}
            onEdit={onEdit}
            onPointer={setPointer}
            onScaleLine={(p0, p1) => {
              setPendingLine([p0, p1]);
              if (Number(lineUm) > 0) {
                setScale({ source: 'two-point', p0, p1, distanceUm: Number(lineUm) }, 'scale line');
                setPendingLine(null);
              }
            }}
            onStage={(s) => (stageRef.current = s)}
          />
        ) : (
          <div className="empty">Open a fractograph (PNG, JPEG or TIFF, 8 or 16 bit) or drop it here.</div>
        )}
        <div className="readout" data-testid="readout">
          {pointer && doc
            ? `x ${pointer.x.toFixed(1)} px, y ${pointer.y.toFixed(1)} px` + (ump ? `  —  x ${fmtNum(pointer.x * ump)} µm, y ${fmtNum(pointer.y * ump)} µm` : '  (no scale)')
            : doc
              ? `${doc.name}: ${doc.widthPx}×${doc.heightPx} px, ${doc.format}, ${doc.bitDepth}-bit`
              : ''}
          {message && (
            <span className="message" data-testid="message">
              {' '}
              — {message}
            </span>
          )}
        </div>
      </main>
      <Results
        doc={doc}
        onMaterial={(m, commit) => doc && update((s) => edit(s, doc.id, { material: m }, commit ? 'commit' : 'transient', 'material'))}
        onMaterialDone={() => update(endDrag)}
        onMaterialFile={(f) => void onMaterialFile(f)}
        onExport={onExport}
        onOpenSession={(f) => void onOpenSession(f)}
      />
      {state.view.showHelp && (
        <div className="help" role="dialog" aria-label="Keyboard shortcuts" onClick={() => update((s) => setView(s, { showHelp: false }))}>
          <div className="help-box" onClick={(e) => e.stopPropagation()}>
            <h2>Keyboard shortcuts</h2>
            <table>
              <tbody>
                {COMMANDS.map((c) => (
                  <tr key={c.name}>
                    <th>
                      <kbd>{c.key}</kbd>
                    </th>
                    <td>{c.label}</td>
                  </tr>
                ))}
                <tr>
                  <th>
                    <kbd>wheel</kbd>
                  </th>
                  <td>Zoom about the cursor</td>
                </tr>
                <tr>
                  <th>
                    <kbd>drag</kbd>
                  </th>
                  <td>Pan (with Pan, Move points, Outline tools: on the background)</td>
                </tr>
              </tbody>
            </table>
            <button onClick={() => update((s) => setView(s, { showHelp: false }))}>Close</button>
          </div>
        </div>
      )}
    </div>
  );
}
