/** Texture map: one roughness feature laid over the image, with the measurement's window. */
import { DEFAULT_FEATURES, isFeatureName } from '../../../core/index.js';
import { featureLabel } from '../../flows/measure.js';
import { setView, type ViewState } from '../../state/store.js';
import type { Update } from '../../hooks/useStore.js';
import { Messages } from '../Messages.js';
import type { PanelProps } from './types.js';

export interface TexturePanelProps extends PanelProps {
  view: ViewState;
  update: Update;
  /** Label of the map shown over this image, or null. */
  shown: string | null;
}

export function TexturePanel(p: TexturePanelProps) {
  const t = p.view.texture;
  const setTexture = (v: Partial<ViewState['texture']>) => p.update((s) => setView(s, { texture: { ...s.view.texture, ...v } }));
  return (
    <section>
      <h2>Texture map</h2>
      <select value={t.feature ?? ''} data-testid="texture-feature" onChange={(e) => setTexture({ feature: isFeatureName(e.target.value) ? e.target.value : null })}>
        <option value="">choose a roughness feature…</option>
        {DEFAULT_FEATURES.map((f) => (
          <option key={f} value={f}>
            {featureLabel(f)}
          </option>
        ))}
      </select>
      <div className="row">
        <button disabled={!t.feature} onClick={() => t.feature && p.flows.showTexture(t.feature)} data-testid="texture-show">
          Show
        </button>
        <button disabled={!p.shown} onClick={() => p.flows.hideTexture()}>
          Hide
        </button>
        <input type="range" min={0} max={1} step={0.05} value={t.opacity} title="opacity" aria-label="opacity of the texture map" onChange={(e) => setTexture({ opacity: Number(e.target.value) })} />
      </div>
      {p.shown && (
        <p className="hint" data-testid="texture-label">
          {p.shown}
        </p>
      )}
      <Messages doc={p.doc} area="texture" />
    </section>
  );
}
