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
  const update = useCallback<Update>((f) => {
    setState((s) => {
      const next = f(s);
      ref.current = next;
      return next;
    });
  }, []);
  const get = useCallback(() => ref.current, []);
  ref.current = state;
  return { state, update, get };
}
