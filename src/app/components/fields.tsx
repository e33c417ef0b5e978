/**
 * Number inputs. `NumberField` commits on Enter or when the field is left; `ApplyField` keeps what
 * is typed (marked as not applied) until Enter or its button. A committed value that the action
 * refuses snaps back to the document's value, with the reason shown beside the panel.
 */
import { useState, type ReactNode } from 'react';

const parse = (t: string): number | null => (t.trim() === '' ? null : Number(t));

export interface NumberFieldProps {
  value: number | null;
  onCommit(v: number | null): void;
  placeholder?: string;
  testId?: string;
  title?: string;
  className?: string;
}

export function NumberField(p: NumberFieldProps) {
  const [draft, setDraft] = useState<string | null>(null);
  const commit = () => {
    if (draft === null) return;
    setDraft(null);
    const v = parse(draft);
    if (v !== p.value) p.onCommit(v);
  };
  return (
    <input
      type="number"
      step="any"
      className={`${p.className ?? ''}${draft !== null ? ' draft' : ''}`}
      value={draft ?? (p.value === null ? '' : String(p.value))}
      placeholder={p.placeholder}
      title={p.title}
      data-testid={p.testId}
      onChange={(e) => setDraft(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => e.key === 'Enter' && commit()}
    />
  );
}

export interface ApplyFieldProps {
  value: number | null;
  onApply(v: number | null): void;
  button: ReactNode;
  placeholder?: string;
  testId?: string;
  buttonTestId?: string;
  unit: string;
  disabled?: boolean;
  title?: string;
}

export function ApplyField(p: ApplyFieldProps) {
  const [draft, setDraft] = useState<string | null>(null);
  const apply = () => {
    p.onApply(draft === null ? p.value : parse(draft));
    setDraft(null);
  };
  return (
    <div className="row">
      <input
        type="number"
        step="any"
        className={draft !== null ? 'draft' : ''}
        value={draft ?? (p.value === null ? '' : String(p.value))}
        placeholder={p.placeholder}
        data-testid={p.testId}
        title={draft !== null ? 'not applied yet: press Enter or the button' : p.title}
        onChange={(e) => setDraft(e.target.value)}
        onKeyDown={(e) => e.key === 'Enter' && apply()}
      />
      <span className="unit">{p.unit}</span>
      <button onClick={apply} data-testid={p.buttonTestId} disabled={p.disabled}>
        {p.button}
      </button>
    </div>
  );
}

/** A labelled row: label, field, unit. */
export function Field(p: { label: ReactNode; unit?: string; children: ReactNode; title?: string }) {
  return (
    <label className="field" title={p.title}>
      <span>{p.label}</span>
      {p.children}
      <span className="unit">{p.unit ?? ''}</span>
    </label>
  );
}

/** A button that opens the file picker; the input is cleared after each choice, so the same file can be chosen again. */
export function FileButton(p: { label: ReactNode; accept: string; testId?: string; multiple?: boolean; onFiles(files: File[]): void }) {
  return (
    <label className="file-button">
      {p.label}
      <input
        type="file"
        multiple={p.multiple}
        accept={p.accept}
        data-testid={p.testId}
        onChange={(e) => {
          const files = Array.from(e.target.files ?? []);
          e.target.value = '';
          if (files.length) p.onFiles(files);
        }}
      />
    </label>
  );
}
