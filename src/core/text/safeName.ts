/**
 * Output file names from user text (an image path, a document name): one rule for every shell.
 * Only ASCII letters, digits, `.`, `_` and `-` are kept (safe on every common file system and in
 * URLs, no quoting needed in shells); anything else becomes `_`.
 */

/** A character that may not appear in an output file name. */
const UNSAFE_CHAR = /[^A-Za-z0-9._-]/g;
/** A run of such characters. */
const UNSAFE_RUN = /[^A-Za-z0-9._-]+/g;

/**
 * @param text - any text
 * @param mode - 'runs' (default): each run of unsafe characters becomes one `_` (`a (1).png` →
 *   `a_1_.png`); 'each': every unsafe character becomes `_` (`a (1).png` → `a__1_.png`; keeps the
 *   batch output names stable for --resume)
 * @returns the text with unsafe characters replaced (may be empty when `text` is)
 */
export function safeFileName(text: string, mode: 'runs' | 'each' = 'runs'): string {
  return text.replace(mode === 'runs' ? UNSAFE_RUN : UNSAFE_CHAR, '_');
}
