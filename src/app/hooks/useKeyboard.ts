/**
 * Keyboard shortcuts. In a number field, letter shortcuts (other than E, the exponent) leave the
 * field and act, so no shortcut is silently swallowed; Escape leaves any field.
 */
import { useEffect } from 'react';
import { commandForKey } from '../state/commands.js';
import type { Update } from './useStore.js';

function inField(t: EventTarget | null): HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement | null {
  return t instanceof HTMLInputElement || t instanceof HTMLSelectElement || t instanceof HTMLTextAreaElement ? t : null;
}

export function useKeyboard(update: Update): void {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const field = inField(e.target);
      if (field && e.key === 'Escape') {
        field.blur();
        return;
      }
      const c = commandForKey(e);
      if (!c) return;
      if (field) {
        const numberField = field instanceof HTMLInputElement && field.type === 'number';
        const letter = e.key.length === 1 && /[a-df-z?]/i.test(e.key) && !e.ctrlKey && !e.metaKey;
        if (!numberField || !letter) return;
        field.blur();
      }
      e.preventDefault();
      update((s) => c.perform(s));
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [update]);
}
