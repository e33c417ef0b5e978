/**
 * `fractozone render --out FILE.(png|jpg|tif)`: write a synthetic fractograph with known truth
 * (FILE.truth.json beside it). Thin shell: parses options, calls core render + encode, writes files.
 */
import { extname } from 'node:path';
import { Command, Option } from 'commander';
import { encodeGrayRaster, type RasterFormat } from '../../core/encode/index.js';
import { FractozoneError } from '../../core/errors.js';
import { renderFractograph, type Corner, type RenderOptions } from '../../core/render/index.js';
import { parseLengthUm } from '../../core/units/units.js';
import { sha256Hex, toJsonText, writeFileAtomic } from '../io.js';

interface Opts {
  out?: string;
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
  bar: string;
  barCorner: string;
  noBar?: boolean;
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

/** Register `render` on the program. */
export function register(program: Command): void {
  program
    .command('render')
    .description('Write a synthetic fractograph of a notched round bar with known truth (FILE.truth.json); everything in it is invented test data.')
    .requiredOption('--out <file>', 'output image: .png (8/16-bit), .jpg (8-bit) or .tif (8/16-bit)')
    .option('--seed <n>', 'random seed (whole number)', '1')
    .option('--size <WxH>', 'image size in px', '1600x1200')
    .option('--pixel-size <length>', 'pixel size (e.g. 4um)', '5um')
    .option('--diameter <length>', 'specimen net diameter (e.g. 5mm)', '5mm')
    .option('--band-width <length>', 'mean width of the smooth rim band (e.g. 400um)', '400um')
    .option('--no-rim', 'no smooth rim band (rough core up to the edge)')
    .option('--tilt <deg>', 'view tilt in degrees (outline becomes an ellipse)', '0')
    .option('--equal-brightness', 'make rim and core equally bright on average (only texture differs)')
    .option('--noise <sigma>', 'Gaussian noise sigma, intensity units 0..1', '0.015')
    .option('--blur <sigma>', 'Gaussian blur sigma in px', '0.8')
    .option('--vignetting <v>', 'vignetting strength 0..1', '0.25')
    .addOption(new Option('--background <kind>', 'background').choices(['dark', 'bright']).default('dark'))
    .option('--bar <length>', 'scale bar length (e.g. 1mm)', '1mm')
    .addOption(new Option('--bar-corner <corner>', 'scale bar corner').choices(['tl', 'tr', 'bl', 'br']).default('br'))
    .option('--no-bar', 'no scale bar')
    .addOption(new Option('--bit-depth <bits>', 'bits per sample (PNG/TIFF; default 8 for PNG, 16 for TIFF)').choices(['8', '16']))
    .option('--jpeg-quality <q>', 'JPEG quality 1..100', '90')
    .option('--json', 'print the result as JSON on stdout')
    .action((o: Opts) => {
      const out = o.out!;
      const format = formatFor(out);
      const m = /^(\d+)x(\d+)$/i.exec(o.size.trim());
      if (!m) usage(`--size "${o.size}" must look like 1600x1200 (width x height in px)`);
      const seed = number(o.seed, '--seed', 0, 4294967295);
      if (!Number.isInteger(seed)) usage(`--seed must be a whole number, got ${o.seed}`);
      const bitDepth = o.bitDepth ? (Number(o.bitDepth) as 8 | 16) : format === 'tiff' ? 16 : 8;
      if (format === 'jpeg' && bitDepth === 16) usage('JPEG files are 8-bit only; use .png or .tif for --bit-depth 16');
      const umPerPx = parseLengthUm(o.pixelSize, '--pixel-size');
      const opts: RenderOptions = {
        seed,
        widthPx: Number(m[1]),
        heightPx: Number(m[2]),
        umPerPx,
        specimen: { diameterUm: parseLengthUm(o.diameter, '--diameter'), tiltDeg: number(o.tilt, '--tilt (°)', 0, 80) },
        rim: o.rim ? { widthUm: parseLengthUm(o.bandWidth, '--band-width') } : false,
        equalMeanBrightness: o.equalBrightness === true,
        noiseSigma: number(o.noise, '--noise', 0, 1),
        blurSigmaPx: number(o.blur, '--blur (px)', 0, 50),
        vignetting: number(o.vignetting, '--vignetting', 0, 1),
        background: o.background as 'dark' | 'bright',
        scaleBar: o.noBar || (o as unknown as { bar: unknown }).bar === false ? null : { lengthUm: parseLengthUm(o.bar, '--bar'), corner: o.barCorner as Corner },
      };
      const quality = number(o.jpegQuality, '--jpeg-quality', 1, 100);
      const t0 = performance.now();
      const { raster, truth } = renderFractograph(opts);
      const ms = performance.now() - t0;
      const bytes = encodeGrayRaster(raster, {
        format,
        bitDepth,
        jpegQuality: quality,
        umPerPx: truth.umPerPxX,
        umPerPxY: truth.umPerPxY,
        description: 'fractozone synthetic fractograph (invented test data)',
      });
      const truthPath = out.replace(/\.[^./\\]+$/, '') + '.truth.json';
      writeFileAtomic(out, bytes);
      writeFileAtomic(truthPath, toJsonText(truth));
      const summary = {
        image: out,
        truth: truthPath,
        sha256: sha256Hex(bytes),
        format,
        bitDepth: format === 'jpeg' ? 8 : bitDepth,
        widthPx: truth.widthPx,
        heightPx: truth.heightPx,
        umPerPx: truth.umPerPxX,
        bandPresent: truth.band.present,
        meanWidthUm: truth.band.meanWidthUm,
        frameCut: truth.frameCut,
        scaleBarLengthPx: truth.scaleBar ? truth.scaleBar.lengthPx : null,
        renderMs: Math.round(ms),
      };
      if (o.json) process.stdout.write(toJsonText(summary));
      else {
        const w = truth.band.meanWidthUm;
        process.stdout.write(
          `wrote ${out} (${truth.widthPx}×${truth.heightPx} px, ${truth.umPerPxX} µm/px, ${format} ${summary.bitDepth}-bit) and ${truthPath}\n` +
            `  band: ${truth.band.present && w !== null ? `mean width ${w.toFixed(1)} µm` : 'none'}; frame cuts specimen: ${truth.frameCut ? 'yes' : 'no'}; scale bar: ${truth.scaleBar ? `${truth.scaleBar.lengthUm} µm = ${truth.scaleBar.lengthPx} px` : 'none'}\n`,
        );
      }
    });
}
