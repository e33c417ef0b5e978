/**
 * `fractozone render --out FILE.(png|jpg|tif)`: write a synthetic fractograph with known truth
 * (FILE.truth.json beside it); `--scene NAME` starts from a scene of the named set, `--scene-set DIR`
 * writes the whole set with truth files and an index, `--list-scenes` lists it. Thin shell: parses
 * options, calls core render + encode, writes files.
 */
import { extname, join } from 'node:path';
import { mkdirSync } from 'node:fs';
import { Command, Option } from 'commander';
import type { RasterFormat } from '../../core/encode/index.js';
import { FractozoneError } from '../../core/errors.js';
import {
  BACKGROUNDS,
  encodeRender,
  findScene,
  renderFractograph,
  SCENE_SET,
  SEM_DETECTOR_LIGHT,
  type Background,
  type Corner,
  type RenderOptions,
  type RenderResult,
  type SceneCase,
} from '../../core/render/index.js';
import { parseLengthUm } from '../../core/units/units.js';
import { sha256Hex, toJsonText, writeFileAtomic } from '../io.js';

interface Opts {
  out?: string;
  scene?: string;
  sceneSet?: string;
  only?: string;
  listScenes?: boolean;
  seed: string;
  size: string;
  pixelSize: string;
  diameter: string;
  bandWidth: string;
  rim: boolean;
  tilt: string;
  equalBrightness?: boolean;
  noise: string;
  blur: string;
  vignetting: string;
  background: string;
  lightAzimuth?: string;
  flank?: string;
  flankRatio?: string;
  flankIncline?: string;
  flankAlbedo?: string;
  shadow?: boolean;
  sem?: boolean;
  semStrip?: string;
  glints?: boolean;
  colour?: boolean;
  colourNoise?: string;
  defocus?: string;
  defocusDirection?: string;
  halves?: boolean;
  rule?: string;
  label?: string;
  bar: string | false;
  barCorner: string;
  bitDepth?: string;
  jpegQuality: string;
  json?: boolean;
}

function usage(msg: string): never {
  throw new FractozoneError('BAD_PARAMETER', msg);
}

function number(text: string, what: string, lo: number, hi: number): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v)) usage(`${what} "${text}" is not a number`);
  if (v < lo || v > hi) usage(`${what} must be between ${lo} and ${hi}, got ${text}`);
  return v;
}

function formatFor(path: string): RasterFormat {
  const e = extname(path).toLowerCase();
  if (e === '.png') return 'png';
  if (e === '.jpg' || e === '.jpeg') return 'jpeg';
  if (e === '.tif' || e === '.tiff') return 'tiff';
  usage(`output "${path}" must end in .png, .jpg or .tif`);
}

/** The base options from the flags; `given(name)` tells whether a flag was typed (not a default). */
function baseOptions(o: Opts, given: (name: string) => boolean): RenderOptions {
  const r: Record<string, unknown> = {};
  if (given('seed')) {
    const seed = number(o.seed, '--seed', 0, 4294967295);
    if (!Number.isInteger(seed)) usage(`--seed must be a whole number, got ${o.seed}`);
    r.seed = seed;
  }
  if (given('size')) {
    const m = /^(\d+)x(\d+)$/i.exec(o.size.trim());
    if (!m) usage(`--size "${o.size}" must look like 1600x1200 (width x height in px)`);
    r.widthPx = Number(m[1]);
    r.heightPx = Number(m[2]);
  }
  if (given('pixelSize')) r.umPerPx = parseLengthUm(o.pixelSize, '--pixel-size');
  const specimen: Record<string, unknown> = {};
  if (given('diameter')) specimen.diameterUm = parseLengthUm(o.diameter, '--diameter');
  if (given('tilt')) specimen.tiltDeg = number(o.tilt, '--tilt (°)', 0, 80);
  if (Object.keys(specimen).length) r.specimen = specimen;
  if (!o.rim) r.rim = false;
  else if (given('bandWidth')) r.rim = { widthUm: parseLengthUm(o.bandWidth, '--band-width') };
  if (given('equalBrightness')) r.equalMeanBrightness = o.equalBrightness === true;
  if (given('noise')) r.noiseSigma = number(o.noise, '--noise', 0, 1);
  if (given('blur')) r.blurSigmaPx = number(o.blur, '--blur (px)', 0, 50);
  if (given('vignetting')) r.vignetting = number(o.vignetting, '--vignetting', 0, 1);
  if (given('background')) r.background = o.background as Background;
  if (o.lightAzimuth !== undefined) r.light = { azimuthDeg: number(o.lightAzimuth, '--light-azimuth (°)', -360, 360) };
  if (o.bar === false) r.scaleBar = null;
  else if (given('bar') || given('barCorner')) r.scaleBar = { lengthUm: parseLengthUm(o.bar, '--bar'), corner: o.barCorner as Corner };
  return r as RenderOptions;
}

/** The scene-element options from the flags (each flag switches its element on). */
function elementOptions(o: Opts): RenderOptions {
  const r: Record<string, unknown> = {};
  if (o.flank !== undefined || o.flankRatio !== undefined || o.flankIncline !== undefined || o.flankAlbedo !== undefined) {
    const kind = (o.flank ?? 'V').toUpperCase();
    if (kind !== 'V' && kind !== 'U') usage(`--flank must be V or U, got "${o.flank}"`);
    r.flank = {
      kind,
      ...(o.flankRatio !== undefined ? { diameterRatio: number(o.flankRatio, '--flank-ratio', 1.02, 3) } : {}),
      ...(o.flankIncline !== undefined ? { inclineDeg: number(o.flankIncline, '--flank-incline (°)', 10, 80) } : {}),
      ...(o.flankAlbedo !== undefined ? { albedo: number(o.flankAlbedo, '--flank-albedo', 0.05, 4) } : {}),
    };
  }
  if (o.shadow) r.shadow = {};
  if (o.sem || o.semStrip !== undefined) {
    r.sem = o.semStrip !== undefined ? { stripHeightPx: number(o.semStrip, '--sem-strip (px)', 0, 20000) } : {};
    r.semEdge = 0.6;
    if (o.lightAzimuth === undefined) r.light = { ...SEM_DETECTOR_LIGHT };
  }
  if (o.glints) r.glints = {};
  if (o.colour || o.colourNoise !== undefined) r.colour = o.colourNoise !== undefined ? { noiseSigma: number(o.colourNoise, '--colour-noise', 0, 0.5) } : {};
  if (o.defocus !== undefined) {
    r.defocus = {
      maxSigmaPx: number(o.defocus, '--defocus (px)', 0, 30),
      ...(o.defocusDirection !== undefined ? { directionDeg: number(o.defocusDirection, '--defocus-direction (°)', -360, 360) } : {}),
    };
  }
  if (o.halves) r.halves = {};
  if (o.rule !== undefined) r.rule = { side: o.rule };
  if (o.label !== undefined) r.label = { text: o.label.replace(/\\n/g, '\n') };
  return r as RenderOptions;
}

/** Scene options overridden by the typed flags (one level deep for the nested groups). */
function mergeOptions(a: RenderOptions, b: RenderOptions): RenderOptions {
  const out: Record<string, unknown> = { ...a };
  for (const [k, v] of Object.entries(b)) {
    const prev = out[k];
    out[k] = v && typeof v === 'object' && !Array.isArray(v) && prev && typeof prev === 'object' ? { ...prev, ...v } : v;
  }
  return out as RenderOptions;
}

function encodeFor(r: RenderResult, format: RasterFormat, bitDepth: 8 | 16, jpegQuality: number, description: string): Uint8Array {
  return encodeRender(r, { format, bitDepth, jpegQuality, umPerPx: r.truth.umPerPxX, umPerPxY: r.truth.umPerPxY, description });
}

function writeOne(o: Opts, cmd: Command): void {
  const out = o.out ?? usage('--out FILE.png|.jpg|.tif is required (or --scene-set DIR, or --list-scenes)');
  const format = formatFor(out);
  const bitDepth = o.bitDepth ? (Number(o.bitDepth) as 8 | 16) : format === 'tiff' ? 16 : 8;
  if (format === 'jpeg' && bitDepth === 16) usage('JPEG files are 8-bit only; use .png or .tif for --bit-depth 16');
  const scene = o.scene !== undefined ? (findScene(o.scene) ?? usage(`unknown scene "${o.scene}"; --list-scenes lists them`)) : null;
  const given = (name: string): boolean => scene === null || cmd.getOptionValueSource(name) === 'cli';
  const opts = mergeOptions(scene ? scene.options : {}, mergeOptions(baseOptions(o, given), elementOptions(o)));
  const quality = number(o.jpegQuality, '--jpeg-quality', 1, 100);
  const t0 = performance.now();
  const r = renderFractograph(opts);
  const ms = performance.now() - t0;
  const bytes = encodeFor(r, format, bitDepth, quality, 'fractozone synthetic fractograph (invented test data)');
  const truthPath = out.replace(/\.[^./\\]+$/, '') + '.truth.json';
  const truth = scene ? { ...r.truth, sceneSet: { name: scene.name, description: scene.description, elements: scene.elements } } : r.truth;
  writeFileAtomic(out, bytes);
  writeFileAtomic(truthPath, toJsonText(truth));
  const t = r.truth;
  const summary = {
    image: out,
    truth: truthPath,
    sha256: sha256Hex(bytes),
    format,
    bitDepth: format === 'jpeg' ? 8 : bitDepth,
    colour: r.rgb !== null,
    widthPx: t.widthPx,
    heightPx: t.heightPx,
    umPerPx: t.umPerPxX,
    bandPresent: t.band.present,
    meanWidthUm: t.band.meanWidthUm,
    specimens: t.specimens ? t.specimens.length : 1,
    sceneElements: t.scene ? t.scene.elements : [],
    frameCut: t.frameCut,
    scaleBarLengthPx: t.scaleBar ? t.scaleBar.lengthPx : null,
    renderMs: Math.round(ms),
  };
  if (o.json) process.stdout.write(toJsonText(summary));
  else {
    const w = t.band.meanWidthUm;
    process.stdout.write(
      `wrote ${out} (${t.widthPx}×${t.heightPx} px, ${t.umPerPxX} µm/px, ${format} ${summary.bitDepth}-bit${summary.colour ? ' RGB' : ''}) and ${truthPath}\n` +
        `  band: ${t.band.present && w !== null ? `mean width ${w.toFixed(1)} µm` : 'none'}; frame cuts specimen: ${t.frameCut ? 'yes' : 'no'}; scale bar: ${t.scaleBar ? `${t.scaleBar.lengthUm} µm = ${t.scaleBar.lengthPx} px` : 'none'}` +
        `${t.scene ? `; scene: ${t.scene.elements.join(', ')}` : ''}\n`,
    );
  }
}

const EXT: Record<SceneCase['format'], string> = { png: 'png', jpeg: 'jpg', tiff: 'tif' };

/** Write every scene of the set (or those named in `only`) with its truth, and DIR/scenes.json listing them. */
function writeSceneSet(dir: string, only: string | undefined, json: boolean): void {
  const names = only === undefined ? null : only.split(',').map((n) => n.trim());
  for (const n of names ?? []) if (!findScene(n)) usage(`unknown scene "${n}" in --only; --list-scenes lists them`);
  mkdirSync(dir, { recursive: true });
  const index: Record<string, unknown>[] = [];
  for (const s of SCENE_SET) {
    if (names && !names.includes(s.name)) continue;
    const r = renderFractograph(s.options);
    const file = `${s.name}.${EXT[s.format]}`;
    const bytes = encodeFor(r, s.format, s.bitDepth ?? 8, s.jpegQuality ?? 92, `fractozone scene ${s.name} (invented test data)`);
    writeFileAtomic(join(dir, file), bytes);
    writeFileAtomic(join(dir, `${s.name}.truth.json`), toJsonText({ ...r.truth, sceneSet: { name: s.name, description: s.description, elements: s.elements } }));
    const t = r.truth;
    index.push({ name: s.name, file, truth: `${s.name}.truth.json`, description: s.description, elements: s.elements, umPerPx: t.umPerPxX, widthPx: t.widthPx, heightPx: t.heightPx, meanWidthUm: t.band.meanWidthUm, specimens: t.specimens ? t.specimens.length : 1, sha256: sha256Hex(bytes) });
    if (!json) process.stdout.write(`${file}  ${t.widthPx}×${t.heightPx} px  ${t.umPerPxX} µm/px  band ${t.band.meanWidthUm ?? '-'} µm  ${s.description}\n`);
  }
  writeFileAtomic(join(dir, 'scenes.json'), toJsonText({ schema: 'fractozone.scene-set/1', invented: true, note: 'synthetic fractographs (invented test data) with their truth files', scenes: index }));
  if (json) process.stdout.write(toJsonText({ dir, scenes: index.length }));
  else process.stdout.write(`wrote ${index.length} scenes and scenes.json to ${dir}\n`);
}

/** Register `render` on the program. */
export function register(program: Command): void {
  program
    .command('render')
    .description('Write a synthetic fractograph of a notched round bar with known truth (FILE.truth.json); everything in it is invented test data.')
    .option('--out <file>', 'output image: .png (8/16-bit gray, 8-bit colour), .jpg (8-bit) or .tif (8/16-bit)')
    .option('--scene <name>', 'start from a scene of the named set (typed options override it)')
    .option('--scene-set <dir>', 'write every scene of the named set with its truth file and scenes.json to DIR')
    .option('--only <names>', 'with --scene-set: only these scenes (comma-separated names)')
    .option('--list-scenes', 'list the scenes of the named set')
    .option('--seed <n>', 'random seed (whole number)', '1')
    .option('--size <WxH>', 'image size in px', '1600x1200')
    .option('--pixel-size <length>', 'pixel size (e.g. 4um)', '5um')
    .option('--diameter <length>', 'specimen net diameter, at the notch root (e.g. 5mm)', '5mm')
    .option('--band-width <length>', 'mean width of the smooth rim band (e.g. 400um)', '400um')
    .option('--no-rim', 'no smooth rim band (rough core up to the edge)')
    .option('--tilt <deg>', 'view tilt in degrees (outline becomes an ellipse)', '0')
    .option('--equal-brightness', 'make rim and core equally bright on average (only texture differs)')
    .option('--noise <sigma>', 'Gaussian noise sigma, intensity units 0..1', '0.015')
    .option('--blur <sigma>', 'Gaussian blur sigma in px', '0.8')
    .option('--vignetting <v>', 'vignetting strength 0..1', '0.25')
    .addOption(new Option('--background <kind>', 'background or holder').choices([...BACKGROUNDS]).default('dark'))
    .option('--light-azimuth <deg>', 'direction the light comes from (0 = right, counter-clockwise)')
    .option('--flank <V|U>', 'show the notch flank around the fracture surface (V cone or U wall)')
    .option('--flank-ratio <r>', 'bar diameter / net diameter of the flank (1.02-3)')
    .option('--flank-incline <deg>', 'V flank inclination from the image plane (10-80)')
    .option('--flank-albedo <a>', 'flank brightness relative to the core (1 = same)')
    .option('--shadow', 'soft shadow of the bar on the background, away from the light')
    .option('--sem', 'SEM look: tilt contrast, edge glow, scan-line noise')
    .option('--sem-strip <px>', 'SEM look with a data strip of this height along the bottom (scale bar inside)')
    .option('--glints', 'specular glints on the slanted rim')
    .option('--colour', 'colour image (RGB) with a heat tint on the band')
    .option('--colour-noise <sigma>', 'colour image with independent per-channel noise')
    .option('--defocus <sigma>', 'one-sided defocus: blur growing to this sigma (px) across the image')
    .option('--defocus-direction <deg>', 'direction in which the defocus grows (default 0 = to the right)')
    .option('--halves', 'both mating halves side by side (truth: one record per half)')
    .addOption(new Option('--rule <side>', 'a steel rule along one side').choices(['top', 'bottom', 'left', 'right']))
    .option('--label <text>', 'a paper specimen label with this text ("\\n" breaks lines)')
    .option('--bar <length>', 'scale bar length (e.g. 1mm)', '1mm')
    .addOption(new Option('--bar-corner <corner>', 'scale bar corner').choices(['tl', 'tr', 'bl', 'br']).default('br'))
    .option('--no-bar', 'no scale bar')
    .addOption(new Option('--bit-depth <bits>', 'bits per sample (PNG/TIFF; default 8 for PNG, 16 for TIFF)').choices(['8', '16']))
    .option('--jpeg-quality <q>', 'JPEG quality 1..100', '90')
    .option('--json', 'print the result as JSON on stdout')
    .action(function (this: Command, o: Opts) {
      if (o.listScenes) {
        for (const s of SCENE_SET) process.stdout.write(`${s.name.padEnd(24)} ${s.description}\n`);
        return;
      }
      if (o.sceneSet !== undefined) {
        if (o.out !== undefined) usage('give either --out FILE or --scene-set DIR, not both');
        writeSceneSet(o.sceneSet, o.only, o.json === true);
        return;
      }
      writeOne(o, this);
    });
}
