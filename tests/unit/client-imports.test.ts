import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

// What the browser bundles: every 'use client' module and the project files it imports as values,
// up to a 'use server' module, which the bundler replaces by a reference. A value import of db/
// there ships drizzle's column builders to every page that draws the component.
const root = path.resolve(import.meta.dirname, '..', '..');
const sourceFolders = ['app', 'components', 'lib'];
const extensions = ['.ts', '.tsx', '/index.ts', '/index.tsx'];

function filesUnder(folder: string): string[] {
  return fs.readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(folder, entry.name);
    if (entry.isDirectory()) return filesUnder(full);
    return /\.tsx?$/.test(entry.name) ? [full] : [];
  });
}

function directive(source: ts.SourceFile): string | null {
  const first = source.statements[0];
  return first && ts.isExpressionStatement(first) && ts.isStringLiteral(first.expression) ? first.expression.text : null;
}

/** Specifiers imported or re-exported as values, and dynamic imports; `import type` and all-`type` lists are left out. */
function valueImports(source: ts.SourceFile): string[] {
  const specifiers: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const clause = node.importClause;
      const named = clause?.namedBindings && ts.isNamedImports(clause.namedBindings) ? clause.namedBindings.elements : null;
      const typeOnly = clause?.isTypeOnly || (clause && !clause.name && named && named.length > 0 && named.every((element) => element.isTypeOnly));
      if (!typeOnly) specifiers.push(node.moduleSpecifier.text);
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      const named = node.exportClause && ts.isNamedExports(node.exportClause) ? node.exportClause.elements : null;
      const typeOnly = node.isTypeOnly || (named && named.length > 0 && named.every((element) => element.isTypeOnly));
      if (!typeOnly) specifiers.push(node.moduleSpecifier.text);
    } else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword && node.arguments[0] && ts.isStringLiteral(node.arguments[0])) {
      specifiers.push(node.arguments[0].text);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return specifiers;
}

/** A project file for '@/…' and relative specifiers; packages are not followed. */
function resolve(specifier: string, from: string): string | null {
  const base = specifier.startsWith('@/') ? path.join(root, specifier.slice(2)) : specifier.startsWith('.') ? path.resolve(path.dirname(from), specifier) : null;
  if (!base) return null;
  if (/\.tsx?$/.test(base) && fs.existsSync(base)) return base;
  for (const extension of extensions) if (fs.existsSync(base + extension)) return base + extension;
  throw new Error(`${path.relative(root, from)} imports ${specifier}, which names no file`);
}

const parsed = new Map<string, ts.SourceFile>();
function parse(file: string): ts.SourceFile {
  let source = parsed.get(file);
  if (!source) {
    source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, false, file.endsWith('.tsx') ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
    parsed.set(file, source);
  }
  return source;
}

/** Every project file the browser gets from one client module, each with the chain that brings it in. */
function clientGraph(entry: string): Map<string, string[]> {
  const chains = new Map<string, string[]>([[entry, [entry]]]);
  const queue = [entry];
  while (queue.length) {
    const file = queue.shift()!;
    const source = parse(file);
    if (file !== entry && directive(source) === 'use server') continue;
    for (const specifier of valueImports(source)) {
      const target = resolve(specifier, file);
      if (!target || chains.has(target)) continue;
      chains.set(target, [...chains.get(file)!, target]);
      queue.push(target);
    }
  }
  return chains;
}

const inDb = (file: string) => path.relative(root, file).startsWith(`db${path.sep}`);

const clientModules = sourceFolders.flatMap((folder) => filesUnder(path.join(root, folder))).filter((file) => directive(parse(file)) === 'use client');

describe('client modules', () => {
  it('are found', () => {
    expect(clientModules.map((file) => path.relative(root, file))).toContain(path.join('components', 'cases', 'forms', 'bench-form.tsx'));
  });

  it('import nothing from db/ as a value, directly or through what they import', () => {
    const offences: string[] = [];
    for (const entry of clientModules) {
      for (const chain of clientGraph(entry).values()) {
        const [into, from] = chain.slice(-2).reverse().map(inDb);
        // Only the step into db/ is named; what the table modules import among themselves follows from it.
        if (into && !from) offences.push(chain.map((f) => path.relative(root, f)).join(' → '));
      }
    }
    expect(offences).toEqual([]);
  });

  it('would be caught importing a table module', () => {
    // The check itself: a client module that imports db/schema as a value is reported.
    const probe = ts.createSourceFile('probe.tsx', "'use client';\nimport { caseStatuses } from '@/db/schema/cases';\nimport type { CaseStatus } from '@/db/schema/cases';\n", ts.ScriptTarget.Latest);
    expect(valueImports(probe)).toEqual(['@/db/schema/cases']);
    expect(path.relative(root, resolve('@/db/schema/cases', path.join(root, 'probe.tsx'))!)).toBe(path.join('db', 'schema', 'cases.ts'));
  });
});
