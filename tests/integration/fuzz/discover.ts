import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

/**
 * Finds every route handler and server action from the source tree, so the coverage test can tell
 * when one has no fuzz entry. Reads source text rather than importing, so a module that needs
 * settings of its own (an SDK's handler) is still found.
 */
export const repoRoot = path.resolve(path.dirname(new URL(import.meta.url).pathname), '../../..');

const HTTP_METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'] as const;

export type DiscoveredTarget = { id: string; file: string; exportName: string; kind: 'route' | 'action' };

function sourceFiles(dir: string): string[] {
  const absolute = path.join(repoRoot, dir);
  return (readdirSync(absolute, { recursive: true }) as string[])
    .filter((name) => /\.(ts|tsx)$/.test(name) && !name.split(path.sep).includes('node_modules'))
    .map((name) => path.join(dir, name).split(path.sep).join('/'))
    .sort();
}

/** Names a module exports: `export const|let|function|async function X`, `export const { X, Y } =` and `export { X, Y as Z }`. */
export function exportedNames(source: string): string[] {
  const names = new Set<string>();
  for (const match of source.matchAll(/^export\s+(?:async\s+)?(?:const|let|var|function\*?)\s+([A-Za-z_$][\w$]*)/gm)) names.add(match[1]);
  for (const match of source.matchAll(/^export\s+(?:const|let|var)\s*\{([^}]*)\}\s*=/gm)) {
    for (const part of match[1].split(',')) {
      const name = part.split(':').pop()?.trim();
      if (name) names.add(name);
    }
  }
  for (const match of source.matchAll(/^export\s*\{([^}]*)\}/gm)) {
    for (const part of match[1].split(',')) {
      const name = part.split(/\s+as\s+/).pop()?.trim();
      if (name && !name.startsWith('type ')) names.add(name);
    }
  }
  return [...names];
}

/** A file-level 'use server' directive: the first statement of the module. */
export function isServerActionModule(source: string): boolean {
  const withoutComments = source.replace(/^\s*(\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*/g, '');
  return /^\s*['"]use server['"]/.test(withoutComments);
}

export function discoverRoutes(): DiscoveredTarget[] {
  return sourceFiles('app')
    .filter((file) => /(^|\/)route\.(ts|tsx)$/.test(file))
    .flatMap((file) =>
      exportedNames(readFileSync(path.join(repoRoot, file), 'utf8'))
        .filter((name) => (HTTP_METHODS as readonly string[]).includes(name))
        .map((exportName) => ({ id: `${file}#${exportName}`, file, exportName, kind: 'route' as const })),
    );
}

export function discoverActions(): DiscoveredTarget[] {
  return ['app', 'lib', 'components']
    .flatMap(sourceFiles)
    .filter((file) => isServerActionModule(readFileSync(path.join(repoRoot, file), 'utf8')))
    .flatMap((file) =>
      // Every export of a 'use server' module is an action (Next refuses anything else); types are erased.
      exportedNames(readFileSync(path.join(repoRoot, file), 'utf8').replace(/^export\s+type\s.*$/gm, ''))
        .map((exportName) => ({ id: `${file}#${exportName}`, file, exportName, kind: 'action' as const })),
    );
}

export function discoverTargets(): DiscoveredTarget[] {
  return [...discoverRoutes(), ...discoverActions()];
}

/** `app/api/v1/cases/[caseId]/route.ts` → `/api/v1/cases/[caseId]`, route groups `(x)` dropped. */
export function urlTemplateOf(file: string): string {
  const segments = file.replace(/^app\//, '').split('/').slice(0, -1).filter((s) => !/^\(.*\)$/.test(s));
  return `/${segments.join('/')}`;
}

/** The dynamic segments of a route file: `[caseId]` → caseId, `[...all]` → all (catch-all). */
export function paramNamesOf(file: string): { name: string; catchAll: boolean }[] {
  return [...file.matchAll(/\[(\.\.\.)?([^\]]+)\]/g)].map((m) => ({ name: m[2], catchAll: !!m[1] }));
}
