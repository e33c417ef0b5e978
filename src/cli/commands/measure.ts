/**
 * `fractozone measure IMAGE`: the whole pipeline on one image. Writes the result JSON and the
 * overlay PNG into --out DIR (atomically), prints a summary (or only the JSON with --json).
 */
import { basename, extname, join } from 'node:path';
import type { Command } from 'commander';
import { analyseImage, encodeOverlayPng, formatValue, specimenLines, summarise, type Figure, type MeasureResult, type ResultSummary } from '../../core/index.js';
import { printableLines } from '../../core/text/printable.js';
import { safeFileName } from '../../core/text/safeName.js';
import { loadCvNode } from '../cvNode.js';
import { nodeDeflate } from '../nodeZlib.js';
import { readInputFile, sha256Hex, stderrLine, toJsonText, writeFileAtomic } from '../io.js';
import { addMeasureOptions, paramsFromOptions, type MeasureCliOptions } from '../measureOptions.js';
import { readModelFile } from '../model.js';

interface Options extends MeasureCliOptions {
  json?: boolean;
  out?: string;
  quiet?: boolean;
}

/** One decimal, or "—". */
const f1 = (f: Figure | number | null): string => formatValue(typeof f === 'number' || f === null ? f : f.value, 1);

function bandLines(s: ResultSummary): string[] {
  const b = s.band;
  if (!b.detected) return [`  band           not detected: ${b.reason}`];
  const lines = [
    `  band width     mean ${f1(b.mean)} µm, 95 % circumferential interval ${f1(b.ci95.lo)}–${f1(b.ci95.hi)} µm (n = ${b.n} rays, n_eff = ${b.nEff.toFixed(1)})`,
    `                 median ${f1(b.median)} µm (95 % circumferential interval ${f1(b.medianCi95.lo)}–${f1(b.medianCi95.hi)} µm), sd ${f1(b.sd)} µm`,
    `                 min ${f1(b.min)} µm, p05 ${f1(b.p05)} µm, p95 ${f1(b.p95)} µm, max ${f1(b.max)} µm`,
  ];
  const u = b.uncertainty;
  if (u) {
    const half = u.measurement.lo !== null && u.measurement.hi !== null ? (u.measurement.hi - u.measurement.lo) / 2 : null;
    const range = u.parameterRange ? `method choices move it ${f1(u.parameterRange.lo)}–${f1(u.parameterRange.hi)} µm` : `no parameter range (${u.rangeNote})`;
    lines.push(
      `  uncertainty    this specimen ${f1(b.mean)} ± ${f1(half)} µm (95 % measurement interval ${f1(u.measurement.lo)}–${f1(u.measurement.hi)} µm); ${range}`,
      `                 budget (standard uncertainties): ${u.budget}`,
    );
  }
  if (b.normalMean) lines.push(`  normal width   mean ${f1(b.normalMean)} µm (along the inward normal of the outer edge)`);
  if (b.areaEquivalent) lines.push(`  area width     ${f1(b.areaEquivalent)} µm (area-equivalent)`);
  if (s.separability) lines.push(`  separability   Fisher ratio ${formatValue(s.separability.fisher.value, 2)}, histogram overlap ${formatValue(s.separability.overlap.value, 3)}`);
  if (b.outliers) lines.push(`  outliers       ${b.outliers.count} rays flagged (${b.outliers.dropped ? 'left out of' : 'kept in'} the statistics)`);
  return lines;
}

function criticalDistanceLines(s: ResultSummary): string[] {
  const lines: string[] = [];
  const cd = s.criticalDistance;
  if (cd) {
    const iv = cd.interval95 ? `, 95 % interval ${f1(cd.interval95.lo)}–${f1(cd.interval95.hi)} µm` : '';
    lines.push(`  critical dist. L = ${f1(cd.L)} µm${iv} [${cd.basis}]${cd.intervalNote ? `; ${cd.intervalNote}` : ''}`);
  }
  const c = s.comparison;
  if (c) {
    const f3 = (v: number | null): string => formatValue(v, 3);
    lines.push(`  comparison     w/${c.reference} = ${f3(c.ratio.value)} (95 % ${f3(c.ratioInterval95.lo)}–${f3(c.ratioInterval95.hi)}): ${c.verdict} (±${c.tolerancePct} %)`);
    lines.push(`                 ${c.basisNote}`);
    if (c.impliedToughness) {
      const ki = c.impliedToughnessInterval95;
      const iv = ki && ki.lo !== null && ki.hi !== null ? `, 95 % interval ${formatValue(ki.lo, 2)}–${formatValue(ki.hi, 2)} MPa·√m` : '';
      lines.push(`  implied K      ${formatValue(c.impliedToughness.value, 2)} MPa·√m${iv} (from the width taken as ${c.reference})`);
    }
  }
  return lines;
}

/** Plain-text summary of a result (figures from core's report/summary.ts); every number carries its unit. */
export function summaryText(r: MeasureResult): string {
  const s = summarise(r);
  const lines: string[] = [];
  lines.push(`${s.file}  (${s.image})`);
  lines.push(`  quality        ${s.quality.headline.replace(/^\w+/, (v) => v.toUpperCase())}`);
  for (const w of s.quality.reasons) lines.push(`                 - ${w.message} [${w.code}]`);
  lines.push(`  scale          ${(s.scale.umPerPx.value ?? NaN).toPrecision(5)} µm/px  [${s.scale.source}: ${s.scale.detail}]`);
  lines.push(`  specimen       centre (${f1(s.specimen.centerPx.x)}, ${f1(s.specimen.centerPx.y)}) px, radius ${f1(s.specimen.radius)} µm` + (s.specimen.cutByFrame ? ' (cut by the frame)' : ''));
  const es = r.specimen.edgeSearch;
  if (es) {
    const others = es.candidates.filter((c) => c.role !== 'chosen' && c.coverage >= 0.5).map((c) => `⌀${(c.diameterUm / 1000).toFixed(2)} mm`);
    const chosen = es.candidates.find((c) => c.role === 'chosen');
    const what = es.outlineFromSilhouette ? 'silhouette of the part' : 'the chosen edge';
    lines.push(`  outline        ${what}${chosen ? `, ⌀${(chosen.diameterUm / 1000).toFixed(3)} mm (${es.rule})` : ` (${es.rule})`}` + (others.length ? `; other closed edges ${others.join(', ')}` : ''));
  }
  if (r.model) {
    const c = r.model.confidence;
    lines.push(`  model          ${r.model.sha256.slice(0, 12)}… (pixel classifier, out-of-bag accuracy ${(r.model.oobAccuracy * 100).toFixed(1)} %); confidence along the boundary ${c.boundary === null ? '—' : c.boundary.toFixed(2)}, outer edge ${c.outerEdge.toFixed(2)}`);
  }
  lines.push(...bandLines(s));
  for (const l of specimenLines(r)) lines.push(`  specimens      ${l}`);
  lines.push(...criticalDistanceLines(s));
  for (const w of s.notes) lines.push(`  note           ${w.message} [${w.code}]`);
  lines.push(`  ${s.caution}`);
  return lines.join('\n') + '\n';
}

/** File stem for outputs: the image name without extension, with unsafe characters replaced. */
export function outputStem(file: string): string {
  const stem = safeFileName(basename(file, extname(file))).slice(0, 120);
  return stem || 'image';
}

export function register(program: Command): void {
  const cmd = program
    .command('measure')
    .description('measure the smooth rim band of one fractograph: scale, outline, boundary, width statistics, critical-distance comparison')
    .argument('<image>', 'PNG, JPEG or TIFF fractograph');
  addMeasureOptions(cmd)
    .option('--out <dir>', 'write <name>.result.json and <name>.overlay.png into this folder')
    .option('--json', 'print only the result JSON on stdout')
    .option('-q, --quiet', 'no progress messages on stderr')
    .action(async (image: string, o: Options) => {
      const params = paramsFromOptions(o);
      const model = o.model !== undefined ? readModelFile(o.model) : undefined;
      if (model) params.modelSha256 = model.sha256;
      const bytes = readInputFile(image);
      loadCvNode();
      const progress = o.quiet || o.json || !process.stderr.isTTY ? undefined : (stage: string) => process.stderr.write(`\r  ${stage}…`.padEnd(40));
      const { result, overlay } = await analyseImage(bytes, { file: basename(image), sha256: sha256Hex(bytes) }, params, progress, { model });
      if (progress) process.stderr.write('\r'.padEnd(41) + '\r');
      if (o.json) process.stdout.write(toJsonText(result));
      else process.stdout.write(printableLines(summaryText(result)));
      if (o.out) {
        const stem = outputStem(image);
        writeFileAtomic(join(o.out, `${stem}.result.json`), toJsonText(result));
        writeFileAtomic(join(o.out, `${stem}.overlay.png`), encodeOverlayPng(overlay, nodeDeflate));
        if (!o.json && !o.quiet) stderrLine(`wrote ${join(o.out, `${stem}.result.json`)} and ${join(o.out, `${stem}.overlay.png`)}`);
      }
    });
}
