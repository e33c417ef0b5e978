/**
 * `fractozone measure IMAGE`: the whole pipeline on one image. Writes the result JSON and the
 * overlay PNG into --out DIR (atomically), prints a summary (or only the JSON with --json).
 */
import { basename, extname, join } from 'node:path';
import type { Command } from 'commander';
import { analyseImage, encodeOverlayPng, type MeasureResult } from '../../core/pipeline/index.js';
import { loadCvNode } from '../cv-node.js';
import { printableLines } from '../../core/text/printable.js';
import { safeFileName } from '../../core/text/safe-name.js';
import { readInputFile, sha256Hex, stderrLine, toJsonText, writeFileAtomic } from '../io.js';
import { addMeasureOptions, paramsFromOptions, type MeasureCliOptions } from '../measureOptions.js';

interface Options extends MeasureCliOptions {
  json?: boolean;
  out?: string;
  quiet?: boolean;
}

const f1 = (v: number | null | undefined): string => (v === null || v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(1));

/** Plain-text summary of a result; every number carries its unit. */
export function summaryText(r: MeasureResult): string {
  const lines: string[] = [];
  lines.push(`${r.input.file}  (${r.input.format}, ${r.input.widthPx}×${r.input.heightPx} px, ${r.input.bitDepth}-bit)`);
  lines.push(`  scale          ${r.scale.umPerPx.toPrecision(5)} µm/px  [${r.scale.source}: ${r.scale.detail}]`);
  lines.push(
    `  specimen       centre (${f1(r.specimen.center.x)}, ${f1(r.specimen.center.y)}) px, radius ${f1(r.specimen.radiusUm)} µm` +
      (r.specimen.touchesFrame ? ' (cut by the frame)' : ''),
  );
  const b = r.band;
  if (!b.detected || !b.widthUm) {
    lines.push(`  band           not detected: ${b.reason ?? 'no smooth rim'}`);
  } else {
    const w = b.widthUm;
    lines.push(`  band width     mean ${f1(w.mean)} µm, 95 % CI ${f1(w.ci95[0])}–${f1(w.ci95[1])} µm (n = ${w.n} rays, n_eff = ${w.nEff.toFixed(1)})`);
    lines.push(`                 median ${f1(w.median)} µm (95 % CI ${f1(w.medianCi95[0])}–${f1(w.medianCi95[1])} µm), sd ${f1(w.sd)} µm`);
    lines.push(`                 min ${f1(w.min)} µm, p05 ${f1(w.p05)} µm, p95 ${f1(w.p95)} µm, max ${f1(w.max)} µm`);
    if (b.normalWidthUm) lines.push(`  normal width   mean ${f1(b.normalWidthUm.mean)} µm (along the inward normal of the outer edge)`);
    if (b.areaEquivalentWidthUm !== null) lines.push(`  area width     ${f1(b.areaEquivalentWidthUm)} µm (area-equivalent)`);
    if (b.separability) lines.push(`  separability   Fisher ratio ${b.separability.fisher.toFixed(2)}, histogram overlap ${b.separability.overlap.toFixed(3)}`);
    if (b.nOutliers) lines.push(`  outliers       ${b.nOutliers} rays flagged (${r.params.dropOutliers ? 'left out of' : 'kept in'} the statistics)`);
  }
  if (r.criticalDistance) {
    const c = r.criticalDistance;
    const iv = c.interval95_um ? `, 95 % interval ${f1(c.interval95_um[0])}–${f1(c.interval95_um[1])} µm` : '';
    lines.push(`  critical dist. L = ${f1(c.L_um)} µm${iv} [${c.basis}]`);
  }
  if (r.comparison) {
    const c = r.comparison;
    lines.push(
      `  comparison     w/${c.reference} = ${c.ratio.toFixed(3)} (95 % ${c.ratioInterval95[0].toFixed(3)}–${c.ratioInterval95[1].toFixed(3)}): ${c.verdict} (±${c.tolerancePct} %)`,
    );
    if (c.impliedToughness_MPa_sqrtm) lines.push(`  implied K      ${c.impliedToughness_MPa_sqrtm.K_MPa_sqrtm.toFixed(2)} MPa·√m (from the width taken as ${c.reference})`);
  }
  for (const w of r.warnings) lines.push(`  warning        ${w}`);
  lines.push(`  ${r.caution}`);
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
      const bytes = readInputFile(image);
      loadCvNode();
      const progress = o.quiet || o.json || !process.stderr.isTTY ? undefined : (stage: string) => process.stderr.write(`\r  ${stage}…`.padEnd(40));
      const { result, overlay } = await analyseImage(bytes, { file: basename(image), sha256: sha256Hex(bytes) }, params, progress);
      if (progress) process.stderr.write('\r'.padEnd(41) + '\r');
      if (o.json) process.stdout.write(toJsonText(result));
      else process.stdout.write(printableLines(summaryText(result)));
      if (o.out) {
        const stem = outputStem(image);
        writeFileAtomic(join(o.out, `${stem}.result.json`), toJsonText(result));
        writeFileAtomic(join(o.out, `${stem}.overlay.png`), encodeOverlayPng(overlay));
        if (!o.json && !o.quiet) stderrLine(`wrote ${join(o.out, `${stem}.result.json`)} and ${join(o.out, `${stem}.overlay.png`)}`);
      }
    });
}
