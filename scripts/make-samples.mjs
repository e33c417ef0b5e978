#!/usr/bin/env node
/**
 * Writes the invented demo test series to samples/ (everything in it is INVENTED test data:
 * the alloy "FZ-7 (invented alloy)", the specimens, the strain rates and the band widths).
 *
 *   npm run build && npm run samples            # all files into samples/
 *   node scripts/make-samples.mjs --out DIR      # into another folder
 *   node scripts/make-samples.mjs --only FILE    # one image (+ its truth) only
 *
 * Reproducible byte for byte: same Node/V8 → same files (seeded renderer, deterministic encoders).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { encodeGrayRaster } from '../dist/core/encode/index.js';
import { renderFractograph } from '../dist/core/render/index.js';

// ---- invented material (FZ-7) -------------------------------------------------------------
const KC = 48; // MPa·√m, invented
const SIGMA0 = 1150; // MPa, invented (quasi-static, 1e-3 1/s)
const RATE_REF = 1e-3; // 1/s
const B_L = -0.05; // invented exponent of L(rate) = A·rate^B
// L = (1/π)(K_c/σ_0)² (Taylor, The Theory of Critical Distances, Elsevier 2007), in µm
const L_REF_UM = (1 / Math.PI) * (KC / SIGMA0) ** 2 * 1e6;
const A_L = L_REF_UM / RATE_REF ** B_L;
// with K_c taken rate-independent (invented), L ∝ σ_0^-2, so σ_0 = A_s·rate^(−B/2)
const B_S = -B_L / 2;
const A_S = SIGMA0 / RATE_REF ** B_S;
const sig = (v, n = 5) => Number(v.toPrecision(n));
const L_at = (rate) => A_L * rate ** B_L;

export const MATERIALS = {
  schema: 'fractozone.materials/1',
  materials: [
    {
      name: 'FZ-7 (invented alloy)',
      invented: true,
      fractureToughness: { value: KC, unit: 'MPa*sqrt(m)', sd: 2.5, source: 'invented for the fractozone demo' },
      inherentStrength: { value: SIGMA0, unit: 'MPa', sd: 45, source: 'invented for the fractozone demo' },
      dynamic: {
        L: { law: 'power', A: sig(A_L), unit: 'um', B: B_L, rateUnit: '1/s', source: 'invented for the fractozone demo: L(1e-3 1/s) = (1/pi)(K_c/sigma_0)^2' },
        inherentStrength: { law: 'power', A: sig(A_S), unit: 'MPa', B: B_S, rateUnit: '1/s', source: 'invented for the fractozone demo: sigma_0 = A*rate^B with K_c rate-independent' },
      },
    },
  ],
};

// ---- the invented test series -------------------------------------------------------------
const NOTCHES = { U: { rootRadiusMm: 1.0, scatter: 1.05 }, V: { rootRadiusMm: 0.25, scatter: 0.95 } };
const MATERIAL_REF = 'materials.json:FZ-7 (invented alloy)';

/** One sample: file name, manifest fields, renderer options, encoding. */
export const SAMPLES = [
  { file: 'fz7-U-r1e-3.jpg', id: 'FZ7-U-01', notch: 'U', rate: 1e-3, umPerPx: 4.5, bar: 1000, corner: 'br', manifestPx: true, seed: 101, format: 'jpeg',
    extra: { light: { azimuthDeg: 135 } } },
  { file: 'fz7-U-r1e0.jpg', id: 'FZ7-U-02', notch: 'U', rate: 1e0, umPerPx: 5.0, bar: 1000, corner: 'bl', manifestPx: false, seed: 102, format: 'jpeg',
    extra: { light: { azimuthDeg: 60 }, specimen: { tiltDeg: 8, tiltAxisDeg: 20 } } },
  { file: 'fz7-U-r1e3.tif', id: 'FZ7-U-03', notch: 'U', rate: 1e3, umPerPx: 5.0, bar: 500, corner: 'tr', manifestPx: true, seed: 103, format: 'tiff', bitDepth: 16,
    size: [1280, 960], umPerPxOverride: 6.0,
    extra: { semEdge: 0.5, vignetting: 0.05, light: { azimuthDeg: 90, elevationDeg: 55, ambient: 0.5 }, noiseSignal: 0.02 } },
  { file: 'fz7-V-r1e-3.png', id: 'FZ7-V-01', notch: 'V', rate: 1e-3, umPerPx: 5.0, bar: 1000, corner: 'tl', manifestPx: true, seed: 201, format: 'png', bitDepth: 8,
    extra: { light: { azimuthDeg: 200 }, rimBrightness: -0.12 } },
  { file: 'fz7-V-r1e0.jpg', id: 'FZ7-V-02', notch: 'V', rate: 1e0, umPerPx: 4.5, bar: 500, corner: 'br', manifestPx: false, seed: 202, format: 'jpeg',
    extra: { light: { azimuthDeg: 300 }, equalMeanBrightness: true, rimSectors: [{ fromDeg: 100, toDeg: 130 }] } },
  { file: 'fz7-V-r1e3.jpg', id: 'FZ7-V-03', notch: 'V', rate: 1e3, umPerPx: 5.0, bar: 500, corner: 'bl', manifestPx: false, seed: 203, format: 'jpeg',
    extra: { background: 'bright', light: { azimuthDeg: 20 } } },
];

function optionsFor(s) {
  const n = NOTCHES[s.notch];
  const widthUm = L_at(s.rate) * n.scatter;
  const px = s.umPerPxOverride ?? s.umPerPx;
  const [w, h] = s.size ?? [1600, 1200];
  const { rimSectors, ...extra } = s.extra;
  return {
    seed: s.seed,
    widthPx: w,
    heightPx: h,
    umPerPx: px,
    ...extra,
    specimen: { diameterUm: 5000, wobble: [{ order: 2, amplitudePct: 0.6, phaseDeg: s.seed % 180 }, { order: 5, amplitudePct: 0.25, phaseDeg: (s.seed * 7) % 360 }], ...(extra.specimen ?? {}) },
    rim: {
      widthUm,
      harmonics: [
        { order: 1, amplitudePct: 6, phaseDeg: (s.seed * 37) % 360 },
        { order: 3, amplitudePct: 4, phaseDeg: (s.seed * 71) % 360 },
        { order: 8, amplitudePct: 2.5, phaseDeg: (s.seed * 13) % 360 },
      ],
      absentSectors: rimSectors ?? [],
      transitionUm: 30 + (s.seed % 3) * 10,
    },
    blurSigmaPx: 0.9,
    noiseSigma: 0.012,
    scaleBar: { lengthUm: s.bar, corner: s.corner, thicknessPx: 8 },
  };
}

/** Render and encode one sample; returns { image bytes, truth JSON text }. */
export function buildSample(s) {
  const opts = optionsFor(s);
  const { raster, truth } = renderFractograph(opts);
  const bytes = encodeGrayRaster(raster, {
    format: s.format,
    bitDepth: s.bitDepth ?? 8,
    jpegQuality: 92,
    ...(s.format !== 'jpeg' ? { umPerPx: truth.umPerPxX, umPerPxY: truth.umPerPxY } : {}),
    description: `fractozone sample ${s.id} - FZ-7 (invented alloy) - invented test data`,
  });
  const t = {
    ...truth,
    sample: {
      note: 'INVENTED demo data: invented alloy, invented specimen, invented test',
      specimenId: s.id,
      notch: s.notch,
      notchRootRadiusMm: NOTCHES[s.notch].rootRadiusMm,
      strainRatePerS: s.rate,
      material: MATERIAL_REF,
      criticalDistanceAtRateUm: sig(L_at(s.rate)),
      bandWidthFactorForNotch: NOTCHES[s.notch].scatter,
    },
  };
  return { bytes, truthText: JSON.stringify(t, null, 2) + '\n' };
}

function manifestCsv() {
  const head = 'file,specimen_id,notch,notch_root_radius_mm,strain_rate_per_s,pixel_size_um,bar_length_um,material';
  const rows = SAMPLES.map((s) => {
    const px = s.manifestPx ? String(s.umPerPxOverride ?? s.umPerPx) : '';
    return [s.file, s.id, s.notch, NOTCHES[s.notch].rootRadiusMm.toFixed(2), String(s.rate), px, String(s.bar), MATERIAL_REF].join(',');
  });
  return [head, ...rows].join('\n') + '\n';
}

const README = `# fractozone samples — INVENTED test series

Everything in this folder is **invented** demo data made by \`scripts/make-samples.mjs\`:
the alloy "FZ-7 (invented alloy)", its properties (materials.json), the specimens, the notches,
the strain rates and the band widths. No image shows a real specimen; no number is a measurement.

- 6 synthetic fractographs: two notch shapes (U, root radius 1.0 mm; V, root radius 0.25 mm)
  × three strain rates (1e-3, 1e0, 1e3 1/s); net diameter 5 mm; burned-in scale bars.
- Each image has \`<name>.truth.json\` (schema fractozone.truth/1): the exact outline, rim/core boundary
  and band width along 360 rays, from the same geometry that drew the image.
- \`manifest.csv\`: one row per image; some rows give the pixel size, others only the scale-bar length.
- \`materials.json\`: the invented material sheet (schema fractozone.materials/1).

Invented material: K_c = ${KC} MPa·√m, σ_0 = ${SIGMA0} MPa (at 1e-3 1/s) → L = (1/π)(K_c/σ_0)² ≈ ${L_REF_UM.toFixed(0)} µm;
L(rate) = A·rate^B with A ≈ ${A_L.toFixed(1)} µm, B = ${B_L} (≈ ${L_at(1e3).toFixed(0)} µm at 1e3 1/s);
band widths in the images: L(rate) × 1.05 (U notch) or × 0.95 (V notch), with angular variation;
fz7-V-r1e0.jpg has a damaged sector (no band from 100° to 130°).

Regenerate (byte for byte identical with the same Node version):

    npm run build && npm run samples
`;

function main(argv) {
  let out = new URL('../samples/', import.meta.url).pathname;
  let only = null;
  for (let i = 2; i < argv.length; i++) {
    if (argv[i] === '--out') out = argv[++i];
    else if (argv[i] === '--only') only = argv[++i];
    else {
      process.stderr.write(`make-samples: unknown argument ${argv[i]}\n`);
      process.exit(2);
    }
  }
  mkdirSync(out, { recursive: true });
  const list = only ? SAMPLES.filter((s) => s.file === only) : SAMPLES;
  if (list.length === 0) {
    process.stderr.write(`make-samples: no sample named ${only}\n`);
    process.exit(2);
  }
  for (const s of list) {
    const { bytes, truthText } = buildSample(s);
    writeFileSync(join(out, s.file), bytes);
    writeFileSync(join(out, s.file.replace(/\.[^.]+$/, '') + '.truth.json'), truthText);
    process.stdout.write(`${s.file}: ${bytes.length} bytes\n`);
  }
  if (!only) {
    writeFileSync(join(out, 'manifest.csv'), manifestCsv());
    writeFileSync(join(out, 'materials.json'), JSON.stringify(MATERIALS, null, 2) + '\n');
    writeFileSync(join(out, 'README.md'), README);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) main(process.argv);
