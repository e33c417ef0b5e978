/**
 * Material and critical distance: the series' material (or this image's own), the image's strain
 * rate, what is missing (beside the form), and the comparison of the width with L.
 */
import type { Material } from '../../../core/index.js';
import { materialOf, type MaterialForm, type TypedValue } from '../../state/document.js';
import { materialProblem, sheetMaterial } from '../../state/material.js';
import { chooseSheetMaterial, ownMaterial, setMaterial, setStrainRate } from '../../state/actions/inputs.js';
import { resultStateOf } from '../../state/results.js';
import { withoutCliHints } from '../../state/words.js';
import { Field, FileButton, NumberField } from '../fields.js';
import { Messages } from '../Messages.js';
import { ComparisonTable } from './ComparisonTable.js';
import { num, type PanelProps } from './types.js';

function ValueRow(p: { label: string; unit: string; value: TypedValue | null; fromSheet: { value: number; sd?: number } | null; testId: string; onCommit(v: TypedValue | null): void }) {
  const sheetV = p.fromSheet ? num(p.fromSheet.value) : '';
  const sheetSd = p.fromSheet?.sd !== undefined ? num(p.fromSheet.sd) : 'sd';
  return (
    <label className="field pair">
      <span>{p.label}</span>
      <span className="pair-inputs">
        <NumberField value={p.value?.value ?? null} placeholder={sheetV} testId={p.testId} onCommit={(v) => p.onCommit(v === null ? null : { value: v, sd: p.value?.sd ?? null })} />
        <span className="pm">±</span>
        <NumberField value={p.value?.sd ?? null} placeholder={sheetSd} testId={`${p.testId}-sd`} title="standard deviation" onCommit={(sd) => p.onCommit(p.value ? { value: p.value.value, sd } : null)} />
      </span>
      <span className="unit">{p.unit}</span>
    </label>
  );
}

function SheetRow(p: PanelProps & { form: MaterialForm }) {
  const mat: Material | null = sheetMaterial(p.form);
  return (
    <div className="sheet">
      <FileButton label={p.form.sheet ? 'Another material sheet…' : 'Read a material sheet…'} accept=".json,.csv,application/json,text/csv" testId="material-sheet" onFiles={([f]) => p.flows.openMaterialSheet(f)} />
      {p.form.sheet && (
        <select value={p.form.sheet.chosen} data-testid="material-choice" onChange={(e) => p.act('material', (d, s) => chooseSheetMaterial(d, s, p.form, e.target.value))}>
          {p.form.sheet.materials.map((m) => (
            <option key={m.name} value={m.name}>
              {m.name}
            </option>
          ))}
        </select>
      )}
      {mat && (
        <p className="hint">
          from {p.form.sheet?.file}
          {mat.invented ? ' — invented demo data' : ''}. Grey values are the sheet’s; a typed value overrides it.
        </p>
      )}
    </div>
  );
}

export function MaterialPanel(p: PanelProps) {
  const { doc, series, act } = p;
  const form = materialOf(doc, series);
  const mat = sheetMaterial(form);
  const law = mat?.dynamic?.L;
  const problem = materialProblem(form, doc.strainRatePerS) ?? (doc.materialError ? `The material could not be applied: ${withoutCliHints(doc.materialError)}` : null);
  const set = (patch: Partial<MaterialForm>) => act('material', (d, s) => setMaterial(d, s, patch));
  const rs = resultStateOf(doc, series);
  return (
    <section>
      <h2>Material and critical distance</h2>
      <label className="field scope">
        <span>material for</span>
        <select value={doc.material ? 'own' : 'series'} data-testid="material-scope" onChange={(e) => act('material', (d, s) => ownMaterial(d, s, e.target.value === 'own'))}>
          <option value="series">all images</option>
          <option value="own">this image only</option>
        </select>
        <span />
      </label>
      <SheetRow {...p} form={form} />
      <ValueRow label="toughness K_c" unit="MPa·√m" value={form.toughness} fromSheet={mat?.fractureToughness ?? null} testId="kc" onCommit={(v) => set({ toughness: v })} />
      <ValueRow label="strength σ₀" unit="MPa" value={form.strength} fromSheet={mat?.inherentStrength ?? null} testId="sigma0" onCommit={(v) => set({ strength: v })} />
      <Field label="strain rate (this image)" unit="1/s">
        <NumberField value={doc.strainRatePerS} placeholder="none" testId="strain-rate" onCommit={(v) => act('material', (d) => setStrainRate(d, v))} />
      </Field>
      <label className="field pair">
        <span title="strain-rate law for the critical distance">rate law L = A·ε̇^B</span>
        <span className="pair-inputs two">
          <NumberField value={form.rateLaw?.A ?? null} placeholder={law?.law === 'power' ? num(law.A) : 'A'} testId="law-a" onCommit={(A) => set({ rateLaw: A === null && (form.rateLaw?.B ?? null) === null ? null : { A, B: form.rateLaw?.B ?? null } })} />
          <NumberField value={form.rateLaw?.B ?? null} placeholder={law?.law === 'power' ? num(law.B) : 'B'} testId="law-b" onCommit={(B) => set({ rateLaw: B === null && (form.rateLaw?.A ?? null) === null ? null : { A: form.rateLaw?.A ?? null, B } })} />
        </span>
        <span className="unit">µm</span>
      </label>
      <label className="field">
        <span>compare width with</span>
        <select value={form.reference} onChange={(e) => set({ reference: e.target.value === 'L/2' ? 'L/2' : e.target.value === '2L' ? '2L' : 'L' })}>
          <option value="L">L</option>
          <option value="L/2">L/2</option>
          <option value="2L">2L</option>
        </select>
        <span />
      </label>
      <Field label="tolerance" unit="%">
        <NumberField value={form.tolerancePct} testId="tolerance" onCommit={(v) => set({ tolerancePct: v ?? NaN })} />
      </Field>
      {problem && (
        <p className="problem" data-testid="material-problem" role="alert">
          {problem}
        </p>
      )}
      <Messages doc={doc} area="material" />
      {doc.result && <ComparisonTable r={doc.result} stale={rs.state !== 'current'} />}
    </section>
  );
}
