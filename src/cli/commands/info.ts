/**
 * `fractozone info IMAGE...`: what an image file holds — format, size, bit depth, channels, colour
 * type, pages, the pixel size stored in its metadata and the automatically detected scale bar (with
 * `--bar-length`, the resulting µm/px). Thin shell: reads files, calls core decode + calibrate.
 */
import { basename } from 'node:path';
import type { Command } from 'commander';
import {
  decodeImage,
  detectScaleBar,
  FractozoneError,
  isFractozoneError,
  parseLengthUm,
  scaleFromBar,
  TOOL_NAME,
  TOOL_VERSION,
  type BoxPx,
  type ImageFacts,
  type MetadataScale,
  type ScaleBar,
} from '../../core/index.js';
import { printable, printableLines } from '../../core/text/printable.js';
import { loadCvNode } from '../cvNode.js';
import { readInputFile, sha256Hex, toJsonText } from '../io.js';

interface Options {
  barLength?: string;
  maxPixels?: string;
  json?: boolean;
}

function fmt(v: number, digits = 4): string {
  return Number(v.toPrecision(digits)).toString();
}

function r3(v: number): number {
  return Math.round(v * 1000) / 1000;
}

/** The detected bar in `info --json` (px; µm/px when the bar length is given). */
interface BarRecord extends Omit<ScaleBar, 'labelBox' | 'plate'> {
  labelBox: BoxPx | null;
  plate: BoxPx | null;
  barLengthUm?: number;
  umPerPx?: number;
  umPerPxX?: number;
  umPerPxY?: number;
}

/** One image in `info --json`. */
interface InfoRecord extends ImageFacts {
  tool: string;
  toolVersion: string;
  file: string;
  sha256: string;
  compression: string | null;
  metadataScale: Pick<MetadataScale, 'umPerPxX' | 'umPerPxY' | 'source'> | null;
  metadataNote: string | null;
  scaleBar: BarRecord | null;
}

/** An unreadable image among several in `info --json`. */
interface InfoError {
  tool: string;
  toolVersion: string;
  file: string;
  error: { code: string; message: string };
}

function barJson(bar: ScaleBar, barLengthUm: number | undefined, aspect: number): BarRecord {
  const o: BarRecord = {
    x0: r3(bar.x0),
    y0: r3(bar.y0),
    x1: r3(bar.x1),
    y1: r3(bar.y1),
    lengthPx: r3(bar.lengthPx),
    thicknessPx: r3(bar.thicknessPx),
    orientation: bar.orientation,
    polarity: bar.polarity,
    confidence: bar.confidence,
    labelBox: bar.labelBox ?? null,
    plate: bar.plate ?? null,
  };
  if (barLengthUm !== undefined) {
    const s = scaleFromBar(bar, barLengthUm, aspect);
    o.barLengthUm = barLengthUm;
    o.umPerPx = s.umPerPx;
    o.umPerPxX = s.umPerPxX;
    o.umPerPxY = s.umPerPxY;
  }
  return o;
}

/** Inspect one file; returns the JSON record and the text lines. */
function inspect(path: string, barLengthUm: number | undefined, maxPixels: number | undefined): { json: InfoRecord; text: string[] } {
  const bytes = readInputFile(path);
  const img = decodeImage(bytes, maxPixels !== undefined ? { maxPixels } : undefined);
  const bar = detectScaleBar(img.raster);
  const meta = img.metadataScale;
  const aspect = meta ? meta.umPerPxY / meta.umPerPxX : 1;
  const json: InfoRecord = {
    tool: TOOL_NAME,
    toolVersion: TOOL_VERSION,
    file: path,
    sha256: sha256Hex(bytes),
    format: img.format,
    widthPx: img.widthPx,
    heightPx: img.heightPx,
    bitDepth: img.bitDepth,
    channels: img.channels,
    colorType: img.colorType,
    pageCount: img.pageCount,
    compression: img.compression ?? null,
    metadataScale: meta ? { umPerPxX: meta.umPerPxX, umPerPxY: meta.umPerPxY, source: meta.source } : null,
    metadataNote: img.metadataNote ?? null,
    scaleBar: bar ? barJson(bar, barLengthUm, aspect) : null,
  };
  const text: string[] = [];
  text.push(`${basename(path)}`);
  text.push(
    `  format: ${img.format.toUpperCase()}, ${img.widthPx} × ${img.heightPx} px, ${img.bitDepth} bit, ${img.channels} channel${img.channels === 1 ? '' : 's'} (${img.colorType}), ${img.pageCount} page${img.pageCount === 1 ? '' : 's'}${img.compression ? `, ${img.compression}` : ''}`,
  );
  text.push(`  sha256: ${json.sha256}`);
  if (meta) {
    const size = meta.umPerPxX === meta.umPerPxY ? `${fmt(meta.umPerPxX)} µm/px` : `${fmt(meta.umPerPxX)} × ${fmt(meta.umPerPxY)} µm/px (x × y)`;
    text.push(`  metadata scale: ${size} (${meta.source})${img.metadataNote ? `; ${img.metadataNote}` : ''}`);
  } else {
    text.push(`  metadata scale: none${img.metadataNote ? ` (${img.metadataNote})` : ''}`);
  }
  if (bar) {
    text.push(
      `  scale bar: ${bar.orientation} ${bar.polarity} bar, ${bar.lengthPx.toFixed(1)} px long, ${bar.thicknessPx.toFixed(1)} px thick, from (${bar.x0.toFixed(1)}, ${bar.y0.toFixed(1)}) to (${bar.x1.toFixed(1)}, ${bar.y1.toFixed(1)}) px, confidence ${bar.confidence.toFixed(2)}`,
    );
    if (barLengthUm !== undefined) {
      const s = scaleFromBar(bar, barLengthUm, aspect);
      text.push(`  bar length ${fmt(barLengthUm)} µm → ${fmt(s.umPerPx)} µm/px`);
    }
  } else {
    text.push('  scale bar: none found');
  }
  return { json, text };
}

export function register(program: Command): void {
  program
    .command('info')
    .description('Show format, size, bit depth, channels, pages, metadata pixel size and the detected scale bar of one or more images.')
    .argument('<images...>', 'image files (PNG, JPEG, TIFF)')
    .option('--bar-length <length>', 'printed length of the scale bar (e.g. 500um, 1mm) to report µm per pixel')
    .option('--max-pixels <n>', 'refuse images with more pixels than this')
    .option('--json', 'print JSON only (an object for one image, an array for several)')
    .addHelpText(
      'after',
      '\nExit codes: 0 ok, 1 an image could not be read, 2 bad option.\nWith several images, unreadable ones are listed with their error and the exit code is 1.',
    )
    .action((images: string[], opts: Options) => {
      const barLengthUm = opts.barLength !== undefined ? parseLengthUm(opts.barLength, '--bar-length') : undefined;
      let maxPixels: number | undefined;
      if (opts.maxPixels !== undefined) {
        const s = String(opts.maxPixels).trim();
        maxPixels = /^\d+$/.test(s) ? Number(s) : NaN;
        if (!Number.isSafeInteger(maxPixels) || maxPixels < 1) {
          throw new FractozoneError('BAD_PARAMETER', `--max-pixels "${opts.maxPixels}" must be a whole number of pixels, at least 1`);
        }
      }
      loadCvNode();
      if (images.length === 1) {
        const { json, text } = inspect(images[0], barLengthUm, maxPixels);
        process.stdout.write(opts.json ? toJsonText(json) : printableLines(text.join('\n')) + '\n');
        return;
      }
      const records: (InfoRecord | InfoError)[] = [];
      const lines: string[] = [];
      let failed = 0;
      for (const path of images) {
        try {
          const { json, text } = inspect(path, barLengthUm, maxPixels);
          records.push(json);
          lines.push(...text);
        } catch (e) {
          if (!isFractozoneError(e)) throw e;
          failed++;
          records.push({ tool: TOOL_NAME, toolVersion: TOOL_VERSION, file: path, error: { code: e.code, message: e.message } });
          process.stderr.write(`fractozone: error [${e.code}]: ${printable(path)}: ${printable(e.message)}\n`);
          lines.push(`${basename(path)}`, `  error [${e.code}]: ${e.message}`);
        }
      }
      process.stdout.write(opts.json ? toJsonText(records) : printableLines(lines.join('\n')) + '\n');
      if (failed > 0) process.exitCode = 1;
    });
}
