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

/**
 * Blur with a σ that varies per pixel (depth of field): the image is blurred at K + 1 evenly spaced
 * levels σ_k = k·maxSigma/K (K = ⌈maxSigma / 0.6⌉; each level from the previous one by a blur of
 * σ = √(σ_k² − σ_(k−1)²), the semigroup property of the Gaussian) and each pixel interpolates linearly
 * between the two levels around its own σ (a layered approximation of a spatially varying Gaussian;
 * common practice, no source). In place.
 * @param sigmaPx per-pixel σ in px (same layout as `data`), clamped to [0, maxSigmaPx]
 */
export function variableBlurInPlace(data: Float32Array, width: number, height: number, sigmaPx: Float32Array, maxSigmaPx: number): void {
  if (!(maxSigmaPx > 0)) return;
  const K = Math.max(1, Math.ceil(maxSigmaPx / 0.6));
  const step = maxSigmaPx / K;
  const n = width * height;
  let top = 0; // highest level any pixel needs
  for (let i = 0; i < n; i++) {
    const v = sigmaPx[i];
    const s = v < 0 ? 0 : v > maxSigmaPx ? maxSigmaPx : v;
    const k = Math.ceil(s / step - 1e-9);
    if (k > top) top = k;
  }
  if (top === 0) return;
  const level = data.slice();
  const acc = new Float32Array(n);
  for (let k = 0; k <= top; k++) {
    const sk = k * step;
    if (k > 0) gaussianBlurInPlace(level, width, height, Math.sqrt(sk * sk - (sk - step) * (sk - step)));
    for (let i = 0; i < n; i++) {
      const v = sigmaPx[i];
      const s = v < 0 ? 0 : v > maxSigmaPx ? maxSigmaPx : v;
      const w = 1 - Math.abs(s - sk) / step;
      if (w > 0) acc[i] += w * level[i];
    }
  }
  data.set(acc);
}
