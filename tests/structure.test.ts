/**
 * Structure rules of the source tree (the "done" limits of issue 10), checked on the syntax tree
 * with the TypeScript compiler API:
 * - no `any` type and no `import.meta.glob` in src/;
 * - `Record<string, unknown>` in at most 12 places in src/ (only where untyped JSON is parsed);
 * - the caution sentence defined once in src/ (src/core/caution.ts);
 * - no function longer than 100 lines in src/core and src/cli, 150 lines in src/app;
 * - no source file longer than 450 lines;
 * - one naming style for files: camelCase (`measureOptions.ts`, `boxMomentsWasm.generated.ts`),
 *   PascalCase only for React components (`.tsx`).
 * The first block shows that each check fails on code that breaks it.
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const SRC = join(ROOT, 'src');

/**
 * Areas other engineers are still restructuring: their files are exempt from every rule here until
 * their work is merged. The lead empties this list when merging; a path listed here that no longer
 * breaks a rule is reported (console) so it can go.
 */
const ALLOW: readonly string[] = [
  // 'src/app/' (web app and worker) was listed too: restructured in the app issue, it breaks no rule
  'src/cli/batch/', // batch machinery: pipeline-processor.ts file name, Record<string, unknown> in record parsing
  // src/core/render/, src/core/decode/, src/cli/main.ts and src/cli/io.ts were listed too; since
  // their work was merged they break no rule and are checked like the rest.
];

const MAX_RECORD_UNKNOWN = 12;
const MAX_FILE_LINES = 450;
const CAUTION_PHRASE = /do not replace,? the judgement/i;

function maxFunctionLines(path: string): number {
  return path.startsWith('src/app/') ? 150 : 100;
}

/** One finding: the rule, the file (relative to the project) and where. */
interface Finding {
  rule: 'any' | 'import.meta.glob' | 'Record<string, unknown>' | 'caution' | 'function length' | 'file length' | 'file name';
  file: string;
  line: number;
  detail: string;
}

function functionName(node: ts.Node): string {
  const named = node as ts.Node & { name?: ts.Node };
  if (named.name && ts.isIdentifier(named.name)) return named.name.text;
  const p = node.parent;
  if (p && ts.isVariableDeclaration(p) && ts.isIdentifier(p.name)) return p.name.text;
  if (p && ts.isPropertyAssignment(p) && ts.isIdentifier(p.name)) return p.name.text;
  if (ts.isConstructorDeclaration(node)) return 'constructor';
  return '(anonymous)';
}

/** Every finding in one source text (`file` is the project-relative path it is reported under). */
export function checkSource(file: string, text: string): Finding[] {
  const sf = ts.createSourceFile(file, text, ts.ScriptTarget.ES2022, true, file.endsWith('.tsx') ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
  const out: Finding[] = [];
  const lineOf = (pos: number): number => sf.getLineAndCharacterOfPosition(pos).line + 1;
  const base = file.slice(file.lastIndexOf('/') + 1);
  if (!/^[a-z][A-Za-z0-9]*(\.[a-z][A-Za-z0-9]*)*\.tsx?$/.test(base) && !/^[A-Z][A-Za-z0-9]*\.tsx$/.test(base)) {
    out.push({ rule: 'file name', file, line: 1, detail: `${base} is not camelCase (PascalCase only for .tsx components)` });
  }
  const lines = text.split('\n').length - (text.endsWith('\n') ? 1 : 0);
  if (lines > MAX_FILE_LINES) out.push({ rule: 'file length', file, line: lines, detail: `${lines} lines > ${MAX_FILE_LINES}` });
  const limit = maxFunctionLines(file);
  const visit = (node: ts.Node): void => {
    if (node.kind === ts.SyntaxKind.AnyKeyword) out.push({ rule: 'any', file, line: lineOf(node.getStart(sf)), detail: node.parent.getText(sf).slice(0, 80) });
    if (
      ts.isPropertyAccessExpression(node) &&
      node.name.text === 'glob' &&
      ts.isMetaProperty(node.expression) &&
      node.expression.keywordToken === ts.SyntaxKind.ImportKeyword
    ) {
      out.push({ rule: 'import.meta.glob', file, line: lineOf(node.getStart(sf)), detail: node.getText(sf) });
    }
    if (
      ts.isTypeReferenceNode(node) &&
      node.typeName.getText(sf) === 'Record' &&
      node.typeArguments?.length === 2 &&
      node.typeArguments[0].kind === ts.SyntaxKind.StringKeyword &&
      node.typeArguments[1].kind === ts.SyntaxKind.UnknownKeyword
    ) {
      out.push({ rule: 'Record<string, unknown>', file, line: lineOf(node.getStart(sf)), detail: node.parent.getText(sf).slice(0, 80) });
    }
    if ((ts.isStringLiteral(node) || ts.isNoSubstitutionTemplateLiteral(node) || ts.isTemplateHead(node) || ts.isJsxText(node)) && CAUTION_PHRASE.test(node.text)) {
      out.push({ rule: 'caution', file, line: lineOf(node.getStart(sf)), detail: node.text.slice(0, 60) });
    }
    if (ts.isFunctionLike(node) && (node as ts.FunctionLikeDeclaration).body) {
      const n = lineOf(node.getEnd()) - lineOf(node.getStart(sf)) + 1;
      if (n > limit) out.push({ rule: 'function length', file, line: lineOf(node.getStart(sf)), detail: `${functionName(node)}: ${n} lines > ${limit}` });
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return out;
}

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) out.push(...sourceFiles(p));
    else if (/\.tsx?$/.test(name) && !name.endsWith('.d.ts')) out.push(p);
  }
  return out.sort();
}

const allowed = (file: string): boolean => ALLOW.some((a) => (a.endsWith('/') ? file.startsWith(a) : file === a));

describe('the structure checks find what they look for', () => {
  const long = (n: number): string => `function f() {\n${'  x++;\n'.repeat(n - 2)}}\n`;
  it('an any, an import.meta.glob, Record<string, unknown>, a second caution, a long function, a long file', () => {
    const rules = (file: string, text: string): string[] => checkSource(file, text).map((f) => f.rule);
    expect(rules('src/core/x.ts', 'const a: any = 1;\nlet b = [] as any[];\n')).toEqual(['any', 'any']);
    expect(rules('src/app/x.ts', "const m = import.meta.glob('./*.ts');\n")).toEqual(['import.meta.glob']);
    expect(rules('src/core/x.ts', '// import.meta.glob in a comment is fine\nconst s = "import.meta.glob";\n')).toEqual([]);
    expect(rules('src/core/x.ts', 'let r: Record<string, unknown> = {};\nlet q: Record<string, number> = {};\n')).toEqual(['Record<string, unknown>']);
    expect(rules('src/app/x.tsx', "const C = 'Results support, and do not replace, the judgement of an engineer.';\n")).toEqual(['caution']);
    expect(rules('src/core/x.ts', long(100))).toEqual([]);
    expect(rules('src/core/x.ts', long(101))).toEqual(['function length']);
    expect(rules('src/app/x.ts', long(150))).toEqual([]);
    expect(rules('src/app/x.ts', `const g = () => {\n${'  x++;\n'.repeat(150)}};\n`)).toEqual(['function length']);
    expect(rules('src/core/x.ts', 'x;\n'.repeat(451))).toEqual(['file length']);
    expect(rules('src/core/x.ts', 'x;\n'.repeat(450))).toEqual([]);
    expect(rules('src/core/tcd/stress-curve.ts', '')).toEqual(['file name']);
    expect(rules('src/core/tcd/Stress.ts', '')).toEqual(['file name']);
    expect(rules('src/app/components/Results.tsx', '')).toEqual([]);
    expect(rules('src/core/texture/kernels/boxMomentsWasm.generated.ts', '')).toEqual([]);
  });
  it('the allow-list covers exactly the listed files and folders', () => {
    expect(allowed('src/app/App.tsx')).toBe(false);
    expect(allowed('src/cli/batch/pool.ts')).toBe(true);
    expect(allowed('src/cli/batchx.ts')).toBe(false);
    expect(allowed('src/core/pipeline/analyse.ts')).toBe(false);
  });
});

describe('source tree limits (issue 10)', () => {
  const files = sourceFiles(SRC).map((p) => relative(ROOT, p).split('\\').join('/'));
  const findings = files.flatMap((f) => checkSource(f, readFileSync(join(ROOT, f), 'utf8')));
  const counted = findings.filter((f) => !allowed(f.file));
  const show = (list: Finding[]): string => list.map((f) => `${f.file}:${f.line} ${f.rule}: ${f.detail}`).join('\n');

  it('no any, no import.meta.glob, no long function, no long file outside the allow-list', () => {
    const bad = counted.filter((f) => f.rule !== 'Record<string, unknown>' && f.rule !== 'caution');
    expect(bad, show(bad)).toEqual([]);
  });
  it(`Record<string, unknown> in at most ${MAX_RECORD_UNKNOWN} places outside the allow-list`, () => {
    const rec = counted.filter((f) => f.rule === 'Record<string, unknown>');
    expect(rec.length, show(rec)).toBeLessThanOrEqual(MAX_RECORD_UNKNOWN);
  });
  it('the caution sentence is defined once, in src/core/caution.ts', () => {
    const c = counted.filter((f) => f.rule === 'caution');
    expect(c.map((f) => f.file), show(c)).toEqual(['src/core/caution.ts']);
  });
  it('lists allow-listed paths that break no rule any more (so they can be taken off)', () => {
    const stale = ALLOW.filter((a) => !findings.some((f) => allowed(f.file) && (a.endsWith('/') ? f.file.startsWith(a) : f.file === a)));
    if (stale.length) console.info(`allow-list entries with no finding left: ${stale.join(', ')}`);
    expect(ALLOW.every((a) => a.startsWith('src/'))).toBe(true);
  });
});
