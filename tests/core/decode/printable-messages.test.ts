/**
 * Decoder messages that quote bytes of the file (a PNG chunk name, a library's complaint) escape
 * control characters: a crafted file cannot put terminal escape sequences into a message.
 */
import { describe, expect, it } from 'vitest';
import { decodeImage, readImageHeader } from '../../../src/core/decode/index.js';
import { isPrintable } from '../../../src/core/text/printable.js';

function u32be(v: number): number[] {
  return [(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255];
}

/** A PNG signature + IHDR (CRC not checked by the structure walk) + a chunk whose type bytes are given, cut short. */
function pngWithOddChunk(typeBytes: number[]): Uint8Array {
  const ihdr = [...u32be(13), 0x49, 0x48, 0x44, 0x52, ...u32be(4), ...u32be(4), 8, 0, 0, 0, 0, 0, 0, 0, 0];
  const odd = [...u32be(1000), ...typeBytes, 1, 2, 3, 4, 5, 6, 7, 8];
  return new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...ihdr, ...odd]);
}

function messageOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error('no error thrown');
}

describe('decoder messages are printable', () => {
  it('a chunk name with NUL, ESC and CSI bytes is quoted escaped', () => {
    const bytes = pngWithOddChunk([0x00, 0x1b, 0x9b, 0x59]);
    const m = messageOf(() => decodeImage(bytes));
    expect(m).toContain('"\\x00\\x1b\\x9bY"');
    expect(isPrintable(m)).toBe(true);
  });

  it('the same for the header read', () => {
    const bytes = pngWithOddChunk([0x07, 0x41, 0x0d, 0x0a]);
    const m = messageOf(() => decodeImage(bytes));
    expect(m).toContain('\\x07A\\x0d\\x0a');
    expect(isPrintable(m)).toBe(true);
    expect(() => readImageHeader(bytes)).toThrow();
  });
});
