/**
 * Keyboard shortcuts. While a field that takes typing has the focus, letter shortcuts that cannot be
 * typed there (a number field, a list) leave the field and act, so no shortcut is silently
 * swallowed; Escape leaves any field. Checkboxes, sliders and buttons never hold shortcuts back.
 */
import { useEffect } from 'react';
import { commandForKey } from '../state/commands.js';
import type { Update } from './useStore.js';

const TYPING = new Set(['text', 'number', 'search', 'email', 'url', 'tel', 'password']);

/** The focused element if it takes typed text; 'letters-free' when letters cannot be typed into it. */
function typingField(t: EventTarget | null): { el: HTMLElement; lettersFree: boolean } | null {
  if (t instanceof HTMLInputElement && TYPING.has(t.type)) return { el: t, lettersFree: t.type === 'number' };
  if (t instanceof HTMLSelectElement) return { el: t, lettersFree: true };
  if (t instanceof HTMLTextAreaElement) return { el: t, lettersFree: false };
  return null;
}

export function useKeyboard(update: Update): void {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const field = typingField(e.target);
      if (field && e.key === 'Escape') {
        field.el.blur();
        return;
      }
      const c = commandForKey(e);
      if (!c) return;
      if (field) {
        // E stays the exponent in a number field; Ctrl shortcuts stay the field's own (text undo)
        const letter = e.key.length === 1 && /[a-df-z?]/i.test(e.key) && !e.ctrlKey && !e.metaKey;
        if (!field.lettersFree || !letter) return;
        field.el.blur();
      }
      e.preventDefault();
      update((s) => c.perform(s));
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [update]);
}
