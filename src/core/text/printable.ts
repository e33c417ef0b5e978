/**
 * Printable text for messages. A message that quotes a file name or bytes from a file (a PNG chunk
 * name, a decoder's complaint, a worker's error line) must not put control characters on the
 * user's terminal: a crafted file name or chunk could otherwise move the cursor, change colours,
 * rewrite the window title or hide text (ECMA-48 control functions start with ESC 0x1B or the C1
 * control CSI 0x9B). Every such character is shown as an escape instead:
 *
 * - C0 controls U+0000–U+001F and DEL U+007F → `\x00` … `\x1f`, `\x7f` (also tab, CR and LF: a
 *   message is one line);
 * - C1 controls U+0080–U+009F → `\x80` … `\x9f`;
 * - invisible Unicode format characters that reorder or hide text — bidirectional marks, embeddings,
 *   overrides and isolates (U+061C, U+200E, U+200F, U+202A–U+202E, U+2066–U+2069; Unicode UAX #9),
 *   the line and paragraph separators U+2028, U+2029, the zero-width no-break space U+FEFF — and
 *   lone surrogate halves → `\u202e` etc.
 *
 * Everything else (letters of any script, µ, ×, °, emoji) is kept. The backslash itself is not
 * escaped, so ordinary text reads as before; `printable` is idempotent (its output contains no
 * character it would escape). Data files keep exact names: CSV and JSON are not passed through it.
 */

function hex2(c: number): string {
  return `\\x${c.toString(16).padStart(2, '0')}`;
}

function hex4(c: number): string {
  return `\\u${c.toString(16).padStart(4, '0')}`;
}

/** True for a code unit / code point that `printable` escapes. */
export function isUnprintable(c: number): boolean {
  return (
    c < 0x20 ||
    (c >= 0x7f && c <= 0x9f) ||
    c === 0x061c ||
    c === 0x200e ||
    c === 0x200f ||
    (c >= 0x202a && c <= 0x202e) ||
    (c >= 0x2066 && c <= 0x2069) ||
    c === 0x2028 ||
    c === 0x2029 ||
    c === 0xfeff ||
    (c >= 0xd800 && c <= 0xdfff)
  );
}

/**
 * Text with every unprintable character escaped (see the module comment).
 *
 * @param text - any string (a file name, a message quoting file content)
 * @returns the same text on one line, control and invisible format characters written as `\xNN` /
 *   `\uNNNN`
 */
export function printable(text: string): string {
  let out = '';
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (!isUnprintable(c)) continue;
    if (c >= 0xd800 && c <= 0xdbff && i + 1 < text.length) {
      const d = text.charCodeAt(i + 1);
      if (d >= 0xdc00 && d <= 0xdfff) {
        i++; // a valid surrogate pair (astral character): keep it
        continue;
      }
    }
    out += text.slice(start, i) + (c <= 0xff ? hex2(c) : hex4(c));
    start = i + 1;
  }
  return start === 0 ? text : out + text.slice(start);
}

/** Several lines: each line made printable, the line breaks (LF) kept. */
export function printableLines(text: string): string {
  return text.split('\n').map(printable).join('\n');
}

/** True when `printable(text) === text`: nothing to escape. */
export function isPrintable(text: string): boolean {
  return printable(text) === text;
}
