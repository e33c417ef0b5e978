/** Pixel patterns for the encoder fixtures (formulas, so tests know the expected samples). */
export const FIXTURE_W = 13;
export const FIXTURE_H = 9;

export function gray8Pattern(): Uint8Array {
  const a = new Uint8Array(FIXTURE_W * FIXTURE_H);
  for (let y = 0; y < FIXTURE_H; y++) for (let x = 0; x < FIXTURE_W; x++) a[y * FIXTURE_W + x] = (x * 19 + y * 23) % 256;
  return a;
}
export function gray16Pattern(): Uint16Array {
  const a = new Uint16Array(FIXTURE_W * FIXTURE_H);
  for (let y = 0; y < FIXTURE_H; y++) for (let x = 0; x < FIXTURE_W; x++) a[y * FIXTURE_W + x] = (x * 4099 + y * 7001 + 1) % 65536;
  return a;
}
export function rgb8Pattern(): Uint8Array {
  const a = new Uint8Array(FIXTURE_W * FIXTURE_H * 3);
  for (let i = 0; i < FIXTURE_W * FIXTURE_H; i++) {
    a[3 * i] = (i * 7) % 256;
    a[3 * i + 1] = (i * 13 + 50) % 256;
    a[3 * i + 2] = 255 - ((i * 3) % 256);
  }
  return a;
}
