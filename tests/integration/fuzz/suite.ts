import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { discoverTargets, type DiscoveredTarget } from './discover';
import { describeCounts, MIN_CASES_PER_TARGET, snapshotDb, totalFor, fuzzScale, type DbSnapshot } from './harness';
import { createFuzzContext } from './context';
import { registry, type ActionSpec, type FuzzContext, type RouteSpec } from './registry';
import { fuzzRoute, plannedRoutes } from './route-fuzz';
import { fuzzAction, plannedActions } from './action-fuzz';

const FUZZ_TIMEOUT_MS = 240_000;

export function targetsOf(group: string): DiscoveredTarget[] {
  return discoverTargets().filter((t) => registry[t.id]?.group === group);
}

/**
 * One test file's share: every target of the group, each dimension a test, then a check that the
 * database is as it was. `exclude` names tables that change on refused input, with the reason.
 */
export function fuzzGroup(group: 'api' | 'sdk' | 'form-actions' | 'value-actions', options: { exclude?: readonly string[]; only?: (t: DiscoveredTarget) => boolean } = {}) {
  const targets = targetsOf(group).filter(options.only ?? (() => true));
  let ctx: FuzzContext & { restoreConsole(): void };
  let before: DbSnapshot;

  beforeAll(async () => {
    ctx = await createFuzzContext();
    before = await snapshotDb(options.exclude);
  });
  afterAll(() => ctx?.restoreConsole());

  for (const target of targets) {
    const spec = registry[target.id];
    describe(target.id, () => {
      const planned = spec.kind === 'route' ? plannedRoutes(target, spec as RouteSpec) : plannedActions(spec as ActionSpec);
      for (const [dimension, runs] of planned) {
        it(`${dimension}: ${runs} generated cases`, { timeout: FUZZ_TIMEOUT_MS }, async () => {
          if (spec.kind === 'route') await fuzzRoute(target, spec, ctx, dimension, runs);
          else await fuzzAction(target, spec, ctx, dimension, runs);
        });
      }
      it('left every table as it was', async () => {
        expect(await snapshotDb(options.exclude)).toEqual(before);
      });
    });
  }

  it(`ran at least ${MIN_CASES_PER_TARGET} cases against each of its ${targets.length} targets`, () => {
    expect(targets.length).toBeGreaterThan(0);
    const summary = describeCounts(targets.map((t) => t.id));
    console.info(`Bad-input fuzzing (seed ${process.env.FUZZ_SEED ?? 'default'}, scale ${fuzzScale}):\n${summary}`);
    for (const t of targets) expect(totalFor(t.id), summary).toBeGreaterThanOrEqual(MIN_CASES_PER_TARGET * Math.min(1, fuzzScale));
  });
}
