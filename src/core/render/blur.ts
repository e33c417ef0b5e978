/**
 * Separable Gaussian blur of a Float32 image in place (edge pixels replicated).
 * Kernel truncated at ⌈3σ⌉ and normalised to sum 1 (common practice, no source).
 */
export function gaussianBlurInPlace(data: Float32Array, width: number, height: number, sigmaPx: number): void {
  if (!(sigmaPx > 0)) return;
  const rad = Math.max(1, Math.ceil(3 * sigmaPx));
  const k = new Float32Array(2 * rad + 1);
  let sum = 0;
  for (let i = -rad; i <= rad; i++) {
    k[i + rad] = Math.exp(-(i * i) / (2 * sigmaPx * sigmaPx));
    sum += k[i + rad];
  }
  for (let i = 0; i < k.length; i++) k[i] /= sum;
  const n = Math.max(width, height);
  const line = new Float32Array(n + 2 * rad);
  // rows
  for (let y = 0; y < height; y++) {
    const o = y * width;
    for (let i = 0; i < rad; i++) line[i] = data[o];
    for (let x = 0; x < width; x++) line[rad + x] = data[o + x];
    for (let i = 0; i < rad; i++) line[rad + width + i] = data[o + width - 1];
    for (let x = 0; x < width; x++) {
      let acc = 0;
      for (let j = 0; j < k.length; j++) acc += k[j] * line[x + j];
      data[o + x] = acc;
    }
  }
  // columns, processed row by row (cache friendly): out row y = Σ_j k[j] · in row clamp(y + j − rad)
  const src = data.slice();
  for (let y = 0; y < height; y++) {
    const o = y * width;
    for (let x = 0; x < width; x++) data[o + x] = 0;
    for (let j = 0; j < k.length; j++) {
      let yy = y + j - rad;
      yy = yy < 0 ? 0 : yy >= height ? height - 1 : yy;
      const kj = k[j];
      const so = yy * width;
      for (let x = 0; x < width; x++) data[o + x] += kj * src[so + x];
    }
  }
}
