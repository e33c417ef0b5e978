/** Scale: the active source always shown; scale bar, typed pixel size, a drawn line, file metadata. */
import { ApplyField } from '../fields.js';
import { Messages } from '../Messages.js';
import { scaleOf } from '../../state/scale.js';
import { setTwoPointScale, setTypedScale, applyMetadataScale, setSectionDiameter } from '../../state/actions/scale.js';
import { chooseEdge } from '../../state/actions/edit.js';
import { edgeCandidatesOf, type Doc } from '../../state/document.js';
import { edgeLabel, edgeRings } from '../../render/layers.js';
import { num, type PanelProps } from './types.js';

export interface ScalePanelProps extends PanelProps {
  /** Length (µm) waiting for a line to be drawn with the scale-line tool. */
  lineUm: number | null;
  onDrawLine(lengthUm: number | null): void;
}

function barStatus(p: ScalePanelProps): string {
  const b = p.doc.bar;
  if (b === undefined) return 'Looking for a scale bar…';
  if (b === null) return 'No scale bar found in this image.';
  const used = p.doc.scale.source === 'scale-bar';
  return `Scale bar found: ${num(b.lengthPx)} px long (${b.orientation})${used ? '' : ' — type its printed length to use it'}.`;
}

export function ScalePanel(p: ScalePanelProps) {
  const { doc, act } = p;
  const s = scaleOf(doc);
  const sc = doc.scale;
  const meta = doc.image.metadataScale;
  return (
    <section>
      <h2>Scale</h2>
      <p className={`scale-active${s.ok ? '' : ' missing'}`} data-testid="scale-source" data-um-per-px={s.ok ? String(s.scale.umPerPx) : ''}>
        {s.ok ? (
          <>
            <strong>{num(s.scale.umPerPx, 5)} µm/px</strong> — {s.scale.detail}
          </>
        ) : (
          s.problem
        )}
      </p>
      <div className="sub">Scale bar, printed length</div>
      <ApplyField
        value={sc.source === 'scale-bar' ? sc.barLengthUm : null}
        unit="µm"
        placeholder="e.g. 1000"
        testId="bar-um"
        buttonTestId="find-bar"
        button={sc.source === 'scale-bar' ? 'Apply' : doc.bar ? 'Use bar' : 'Find bar'}
        onApply={(v) => p.flows.findBar(v)}
      />
      <p className="hint">{barStatus(p)}</p>
      <div className="sub">Pixel size</div>
      <ApplyField value={sc.source === 'typed' ? sc.umPerPx : null} unit="µm/px" placeholder="e.g. 4.5" testId="typed-um" buttonTestId="typed-um-apply" button="Apply" onApply={(v) => act('scale', (d) => setTypedScale(d, v))} />
      <div className="sub">Line along a known length</div>
      <ApplyField
        value={sc.source === 'two-point' ? sc.distanceUm : p.lineUm}
        unit="µm"
        placeholder="e.g. 500"
        testId="line-um"
        button={sc.source === 'two-point' ? 'Apply' : 'Draw line'}
        title="Type the real length, then drag along it on the image"
        onApply={(v) => (sc.source === 'two-point' ? act('scale', () => setTwoPointScale(sc.p0, sc.p1, v)) : p.onDrawLine(v))}
      />
      {meta && sc.source !== 'metadata' && (
        <button onClick={() => act('scale', (d) => applyMetadataScale(d))} data-testid="use-metadata">
          Use the file’s pixel size ({num(Math.sqrt(meta.umPerPxX * meta.umPerPxY), 5)} µm/px)
        </button>
      )}
      <SectionDiameter {...p} />
      <Messages doc={doc} area="scale" />
    </section>
  );
}

/** The measured diameter of the fracture surface (equivalent circle) against the drawing's, when both are known. */
function diameterEcho(doc: Doc): string | null {
  const r = doc.result;
  if (!r) return null;
  const measured = 2 * r.specimen.equivalentRadiusUm;
  const given = r.params.sectionDiameterUm;
  const head = `Measured ⌀ ${num(measured / 1000, 4)} mm (equivalent circle)`;
  if (given === undefined) return `${head}.`;
  const d = (100 * (measured - given)) / given;
  return `${head}, ${d >= 0 ? '+' : '−'}${num(Math.abs(d), 2)} % against the drawing's ${num(given / 1000, 4)} mm.`;
}

/** Net-section diameter from the specimen drawing (mm) and the closed edges the outline was chosen from. */
function SectionDiameter({ doc, act }: ScalePanelProps) {
  const edges = edgeCandidatesOf(doc);
  const inUse = edgeRings(doc).map((r) => r.inUse);
  const rejected = edges.flatMap((e, i) => (e.role === 'rejected' && !inUse[i] ? [i] : []));
  const edgeButton = (i: number) => {
    const e = edges[i];
    return (
      <button key={i} className={`edge ${e.role}${inUse[i] ? ' in-use' : ''}`} data-testid="edge-candidate" data-role={e.role} data-in-use={inUse[i]} data-diameter-um={e.diameterUm} title={e.note} onClick={() => act('edit', (d) => chooseEdge(d, i))}>
        {edgeLabel(e.diameterUm, e.role)}
        {inUse[i] ? ' ✓' : ''}
      </button>
    );
  };
  const echo = diameterEcho(doc);
  return (
    <>
      <div className="sub" title="Net-section diameter at the notch root, from the specimen drawing">Section diameter (from the drawing)</div>
      <ApplyField
        value={doc.sectionDiameterUm === null ? null : doc.sectionDiameterUm / 1000}
        unit="mm"
        placeholder="e.g. 5"
        testId="section-mm"
        buttonTestId="section-mm-apply"
        button="Apply"
        title="Helps pick the fracture surface's own edge and cross-checks the scale (warning above 3 %); empty: not known"
        onApply={(v) => act('scale', (d) => setSectionDiameter(d, v))}
      />
      {echo && (
        <p className="hint" data-testid="section-echo">
          {echo}
        </p>
      )}
      {edges.length > 0 && (
        <div className="edge-list" data-testid="edge-list">
          <div className="sub">Closed edges found (click one to take it as the outline)</div>
          {edges.map((e, i) => (e.role !== 'rejected' || inUse[i] ? edgeButton(i) : null))}
          {rejected.length > 0 && (
            <details className="edge-rejected">
              <summary>{rejected.length} more, rejected by the search</summary>
              {rejected.map((i) => edgeButton(i))}
            </details>
          )}
        </div>
      )}
    </>
  );
}
