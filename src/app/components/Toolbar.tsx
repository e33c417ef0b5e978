/** Edit tools above the image, the options of the tool in use, and undo/redo. */
import { canRedo, canUndo, isTeachTool, redo, setView, undo, type AppState, type Tool } from '../state/store.js';
import { clearLabels } from '../state/actions/teach.js';
import { resetBoundary, resetOutline } from '../state/actions/edit.js';
import type { Update } from '../hooks/useStore.js';
import type { Doc } from '../state/document.js';
import { NumberField } from './fields.js';
import type { Act } from './panels/types.js';

type ToolButton = { tool: Tool; label: string; key: string; title: string };

/** Teach mode's brushes (and panning). */
const TEACH_TOOLS: ToolButton[] = [
  { tool: 'pan', label: 'Pan', key: 'H', title: 'Drag the image' },
  { tool: 'teach-outside', label: 'Outside', key: '', title: 'Brush: paint what lies outside the fracture surface (background, holder, notch flank)' },
  { tool: 'teach-rim', label: 'Rim band', key: '', title: 'Brush: paint the smooth rim band' },
  { tool: 'teach-core', label: 'Core', key: '', title: 'Brush: paint the rough core' },
];

const TOOLS: ToolButton[] = [
  { tool: 'pan', label: 'Pan', key: 'H', title: 'Drag the image' },
  { tool: 'vertex', label: 'Move', key: 'V', title: 'Drag a boundary point' },
  { tool: 'add-vertex', label: 'Add', key: 'A', title: 'Click: the boundary passes through that point' },
  { tool: 'remove-vertex', label: 'Remove', key: 'X', title: 'Click a boundary point to remove it' },
  { tool: 'brush-add', label: 'Rim', key: 'B', title: 'Brush: paint rim (the boundary moves inwards)' },
  { tool: 'brush-remove', label: 'Core', key: 'E', title: 'Brush: paint core (the boundary moves outwards)' },
  { tool: 'sector', label: 'Sector', key: 'S', title: 'Drag around the centre to leave a sector out' },
  { tool: 'outline', label: 'Outline', key: 'O', title: 'Move or reshape the specimen outline, or reset it to a fit' },
  { tool: 'scale-line', label: 'Line', key: 'L', title: 'Scale line: drag along a known length' },
];

export interface ToolbarProps {
  state: AppState;
  doc: Doc | null;
  update: Update;
  act: Act;
}

function ToolOptions({ state, doc, update, act }: ToolbarProps) {
  const tool = state.view.tool;
  if (!doc) return null;
  if (isTeachTool(tool) || (state.view.teach.on && tool === 'pan')) {
    return (
      <span className="tool-options">
        <NumberField value={state.view.teach.radiusUm || null} placeholder="radius" className="narrow" testId="teach-um" onCommit={(v) => update((s) => setView(s, { teach: { ...s.view.teach, radiusUm: v !== null && v > 0 ? v : 0 } }))} />
        µm
        <button onClick={() => act('teach', (d) => clearLabels(d))} disabled={doc.labels.length === 0} data-testid="clear-strokes" title="Remove every stroke of this image">
          Clear
        </button>
      </span>
    );
  }
  if (tool === 'brush-add' || tool === 'brush-remove') {
    return (
      <span className="tool-options">
        radius
        <NumberField value={state.view.brushRadiusUm || null} placeholder="auto" className="narrow" testId="brush-um" onCommit={(v) => update((s) => setView(s, { brushRadiusUm: v !== null && v > 0 ? v : 0 }))} />
        µm
      </span>
    );
  }
  if (tool === 'outline') {
    return (
      <span className="tool-options">
        <button onClick={() => act('edit', (d) => resetOutline(d, 'circle'))} data-testid="outline-circle" title="Replace the outline by the fitted circle">
          Circle fit
        </button>
        <button onClick={() => act('edit', (d) => resetOutline(d, 'ellipse'))} data-testid="outline-ellipse" title="Replace the outline by the fitted ellipse">
          Ellipse fit
        </button>
        <button onClick={() => act('edit', (d) => resetOutline(d, 'found'))} disabled={!doc.outline} title="Back to the edge the measurement found">
          As found
        </button>
      </span>
    );
  }
  if (doc.boundary && (tool === 'vertex' || tool === 'add-vertex' || tool === 'remove-vertex')) {
    return (
      <span className="tool-options">
        <button onClick={() => act('edit', (d) => resetBoundary(d))} title="Back to the boundary the measurement found">
          Automatic boundary
        </button>
      </span>
    );
  }
  return null;
}

export function Toolbar(p: ToolbarProps) {
  const tool = p.state.view.tool;
  return (
    <div className="toolbar" role="toolbar" aria-label="edit tools">
      {(p.state.view.teach.on ? TEACH_TOOLS : TOOLS).map((t) => (
        <button key={t.tool} className={tool === t.tool ? 'on' : ''} onClick={() => p.update((s) => setView(s, { tool: t.tool }))} title={t.key ? `${t.title} (${t.key})` : t.title} data-testid={`tool-${t.tool}`}>
          {t.label}
        </button>
      ))}
      <ToolOptions {...p} />
      <span className="spacer" />
      <button disabled={!canUndo(p.state)} onClick={() => p.update(undo)} data-testid="undo" title="Undo (Ctrl+Z)" aria-label="undo">
        ↶
      </button>
      <button disabled={!canRedo(p.state)} onClick={() => p.update(redo)} data-testid="redo" title="Redo (Ctrl+Y)" aria-label="redo">
        ↷
      </button>
    </div>
  );
}
