/** The app state in React: the latest state, an updater, and a getter for async flows. */
import { useCallback, useRef, useState } from 'react';
import { initialState, type AppState } from '../state/store.js';

export type Update = (f: (s: AppState) => AppState) => void;

export interface Store {
  state: AppState;
  update: Update;
  /** The latest state (for flows that run across awaits). */
  get(): AppState;
}

export function useStore(): Store {
  const [state, setState] = useState<AppState>(initialState);
  const ref = useRef(state);
  // The change is applied to the latest state at once and React is given the result: a flow that
  // reads get() right after update() must see its own change. With a functional setState React may
  // run the updater only at the next render (when other updates are queued), so get() returned the
  // state before the change — "Apply to all" right after a model was opened then measured the
  // shown image with the series' previous model (none) and left it out of date.
  const update = useCallback<Update>((f) => {
    const next = f(ref.current);
    ref.current = next;
    setState(next);
  }, []);
  const get = useCallback(() => ref.current, []);
  return { state, update, get };
}
