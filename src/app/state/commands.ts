/**
 * Commands: `{ name, label, key, perform }`. `perform` returns the new state and never touches the
 * UI; the keyboard handler and the panels both dispatch them. The help overlay lists them.
 */
import { redo, setView, step, undo, type AppState, type Tool } from './store.js';

export interface Command {
  name: string;
  label: string;
  /** Shortcut as shown and matched, e.g. "Ctrl+Z", "V", "Delete". */
  key: string;
  perform(s: AppState): AppState;
}

const tool = (name: string, label: string, key: string, t: Tool): Command => ({
  name,
  label,
  key,
  perform: (s) => setView(s, { tool: t }),
});

export const COMMANDS: Command[] = [
  { name: 'undo', label: 'Undo', key: 'Ctrl+Z', perform: undo },
  { name: 'redo', label: 'Redo', key: 'Ctrl+Y', perform: redo },
  { name: 'redo-alt', label: 'Redo', key: 'Ctrl+Shift+Z', perform: redo },
  tool('tool-pan', 'Pan (drag the image)', 'H', 'pan'),
  tool('tool-vertex', 'Move boundary points', 'V', 'vertex'),
  tool('tool-add-vertex', 'Add point: pull the boundary through a point', 'A', 'add-vertex'),
  tool('tool-remove-vertex', 'Remove boundary point', 'X', 'remove-vertex'),
  tool('tool-brush-add', 'Brush: paint rim', 'B', 'brush-add'),
  tool('tool-brush-remove', 'Brush: paint core', 'E', 'brush-remove'),
  tool('tool-sector', 'Exclude a sector (drag around the centre)', 'S', 'sector'),
  tool('tool-scale-line', 'Scale line (drag along the bar)', 'L', 'scale-line'),
  tool('tool-outline', 'Correct the specimen outline (move, reshape, reset to a fit)', 'O', 'outline'),
  { name: 'next-image', label: 'Next image', key: 'N', perform: (s) => step(s, 1) },
  { name: 'previous-image', label: 'Previous image', key: 'P', perform: (s) => step(s, -1) },
  { name: 'help', label: 'Show / hide this list', key: '?', perform: (s) => setView(s, { showHelp: !s.view.showHelp }) },
  { name: 'close-help', label: 'Close dialogs', key: 'Escape', perform: (s) => setView(s, { showHelp: false }) },
];

/** Normalised shortcut text of a keyboard event-like object. */
export function keyOf(e: { key: string; ctrlKey?: boolean; metaKey?: boolean; shiftKey?: boolean; altKey?: boolean }): string {
  const parts: string[] = [];
  if (e.ctrlKey || e.metaKey) parts.push('Ctrl');
  if (e.altKey) parts.push('Alt');
  const k = e.key.length === 1 ? e.key.toUpperCase() : e.key;
  if (e.shiftKey && (e.ctrlKey || e.metaKey)) parts.push('Shift');
  parts.push(k === 'DEL' ? 'Delete' : k);
  return parts.join('+');
}

/** The command bound to a key event, if any. */
export function commandForKey(e: Parameters<typeof keyOf>[0]): Command | undefined {
  const k = keyOf(e);
  return COMMANDS.find((c) => c.key === k);
}

/** Dispatches a command by name (unknown names leave the state unchanged). */
export function run(s: AppState, name: string): AppState {
  const c = COMMANDS.find((x) => x.name === name);
  return c ? c.perform(s) : s;
}

