/** printable(): control and invisible format characters escaped, everything else kept. */
import { describe, expect, it } from 'vitest';
import { isPrintable, printable, printableLines } from '../../../src/core/text/printable.js';

describe('printable', () => {
  it('escapes C0 controls, DEL and C1 controls as \\xNN', () => {
    expect(printable('a\u0000b')).toBe('a\\x00b');
    expect(printable('\u001b[31mred')).toBe('\\x1b[31mred');
    expect(printable('tab\there\r\nnext')).toBe('tab\\x09here\\x0d\\x0anext');
    expect(printable('del\u007f')).toBe('del\\x7f');
    // CSI as a single C1 character (U+009B) starts a control sequence on many terminals
    expect(printable('\u009b2J')).toBe('\\x9b2J');
    expect(printable('\u0080\u009f')).toBe('\\x80\\x9f');
  });

  it('escapes bidirectional overrides, isolates, line separators, BOM and lone surrogates as \\uNNNN', () => {
    expect(printable('abc\u202edcba')).toBe('abc\\u202edcba');
    expect(printable('\u2066x\u2069')).toBe('\\u2066x\\u2069');
    expect(printable('a\u2028b\u2029c')).toBe('a\\u2028b\\u2029c');
    expect(printable('\ufeffname')).toBe('\\ufeffname');
    expect(printable('x\ud800y')).toBe('x\\ud800y');
    expect(printable('x\udc00')).toBe('x\\udc00');
  });

  it('keeps letters of any script, symbols the tool prints and astral characters', () => {
    for (const s of ['plain.png', 'Größe µm × 2 °', 'срез-1.tif', '断面.jpg', 'emoji 🔬 ok', 'back\\slash', '', 'a "quoted" name']) {
      expect(printable(s)).toBe(s);
      expect(isPrintable(s)).toBe(true);
    }
  });

  it('is idempotent and leaves no unprintable character behind', () => {
    let all = '';
    for (let c = 0; c < 0x300; c++) all += String.fromCharCode(c);
    all += '\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069\u200e\u200f\u061c\ud83d';
    const once = printable(all);
    expect(printable(once)).toBe(once);
    expect(isPrintable(once)).toBe(true);
    // eslint-disable-next-line no-control-regex
    expect(once).not.toMatch(/[\u0000-\u001f\u007f-\u009f]/);
  });

  it('printableLines keeps line feeds and escapes the rest per line', () => {
    expect(printableLines('one\u001b\ntwo\r')).toBe('one\\x1b\ntwo\\x0d');
  });
});
