import { describe, expect, it } from 'vitest';
import { discoverActions, discoverRoutes, exportedNames, isServerActionModule, urlTemplateOf, paramNamesOf } from './discover';
import { registry } from './registry';

describe('bad-input fuzzing covers every entry point', () => {
  const routes = discoverRoutes();
  const actions = discoverActions();

  it('finds the route handlers and server actions in the tree', () => {
    expect(routes.map((r) => r.id)).toContain('app/api/v1/cases/route.ts#POST');
    expect(actions.map((a) => a.id)).toContain('app/(app)/cases/[caseId]/actions.ts#transitionCase');
  });

  it('has a fuzz entry for every discovered route handler and server action', () => {
    const missing = [...routes, ...actions].map((t) => t.id).filter((id) => !registry[id]);
    // A new route or action needs its line in tests/integration/fuzz/registry.ts.
    expect(missing).toEqual([]);
  });

  it('has no entry for something that no longer exists', () => {
    const present = new Set([...routes, ...actions].map((t) => t.id));
    expect(Object.keys(registry).filter((id) => !present.has(id))).toEqual([]);
  });

  it('reads exports and directives the way the tree writes them', () => {
    expect(exportedNames('export const { GET, POST } = createRouteHandler({ router });')).toEqual(['GET', 'POST']);
    expect(exportedNames('export async function POST() {}\nexport const GET = handler;\nexport { PUT as DELETE };')).toEqual(['POST', 'GET', 'DELETE']);
    expect(isServerActionModule("// why\n'use server';\nexport async function a() {}")).toBe(true);
    expect(isServerActionModule("'use client';\nexport function a() {}")).toBe(false);
    expect(urlTemplateOf('app/(app)/x/[id]/route.ts')).toBe('/x/[id]');
    expect(paramNamesOf('app/api/auth/[...all]/route.ts')).toEqual([{ name: 'all', catchAll: true }]);
  });
});
