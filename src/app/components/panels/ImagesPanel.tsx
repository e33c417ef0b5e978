/** The open images: one item each (with whether its result is current), open more, close one. */
import type { AppState } from '../../state/store.js';
import { removeDoc } from '../../state/store.js';
import { resultStateOf } from '../../state/results.js';
import type { Update } from '../../hooks/useStore.js';
import { FileButton } from '../fields.js';

export interface ImagesPanelProps {
  state: AppState;
  update: Update;
  onOpen(files: File[]): void;
  onClose(docId: string): void;
}

const STATE_TEXT = { none: 'not measured', current: 'measured', stale: 'out of date' } as const;

export function ImagesPanel({ state, update, onOpen, onClose }: ImagesPanelProps) {
  return (
    <section>
      <h2>Images</h2>
      <FileButton label="Open images…" multiple accept=".png,.jpg,.jpeg,.tif,.tiff,image/png,image/jpeg,image/tiff" testId="file-input" onFiles={onOpen} />
      <span className="hint"> or drop files on the window</span>
      <ul className="doc-list" data-testid="doc-list">
        {state.docs.map((d) => {
          const rs = resultStateOf(d, state.series).state;
          return (
            <li key={d.id} className={d.id === state.activeId ? 'active' : ''} data-testid="image-item" data-name={d.image.name} data-state={rs}>
              <button className="name" onClick={() => update((s) => ({ ...s, activeId: d.id }))} title={`${d.image.name}: ${d.image.widthPx}×${d.image.heightPx} px, ${d.image.bitDepth}-bit`}>
                <span className={`dot ${rs}`} title={STATE_TEXT[rs]} />
                {d.image.name}
              </button>
              <button
                className="close"
                title="Close this image"
                aria-label={`close ${d.image.name}`}
                onClick={() => {
                  update((s) => removeDoc(s, d.id));
                  onClose(d.id);
                }}
              >
                ×
              </button>
            </li>
          );
        })}
      </ul>
      {state.notices.length > 0 && (
        <ul className="messages" data-testid="notices">
          {state.notices.map((n, i) => (
            <li key={i} className="error">
              {n}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
