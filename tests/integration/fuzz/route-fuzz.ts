import { expect } from 'vitest';
import fc from 'fast-check';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { contentType, garbageCookie, headerName, headerValue, hostileJsonText, nastyJson, nearMissObject, pathParam, queryPairs, rawBody, deepJson } from './arbitraries';
import { countCase, countOutcome, expectClientProblem, fuzz, mentionsAny, type Dimension } from './harness';
import { paramNamesOf, repoRoot, urlTemplateOf, type DiscoveredTarget } from './discover';
import type { FuzzContext, RouteSpec } from './registry';

type RouteHandler = (request: Request, context: { params: Promise<Record<string, string | string[]>> }) => Promise<Response>;

export const NOT_JSON = Symbol('not JSON');

export type RouteCase = {
  caller: string;
  params: Record<string, string>;
  query: [string, string][];
  headers: [string, string][];
  body?: { payload: string | Uint8Array; contentType?: string };
};

export async function loadExport<T>(target: DiscoveredTarget): Promise<T> {
  const module = (await import(/* @vite-ignore */ pathToFileURL(path.join(repoRoot, target.file)).href)) as Record<string, unknown>;
  const found = module[target.exportName];
  expect(typeof found, `${target.id} is not a function`).toBe('function');
  return found as T;
}

/** What readJsonBody would see, so the safety filter judges the body the handler gets. */
function parsedAs(payload: string | Uint8Array, type: string | undefined): unknown {
  if (!type || !/^application\/(.+\+)?json\b/i.test(type)) return NOT_JSON;
  try {
    return JSON.parse(typeof payload === 'string' ? payload : new TextDecoder().decode(payload));
  } catch {
    return NOT_JSON;
  }
}

function fieldValue(ctx: FuzzContext): fc.Arbitrary<unknown> {
  return fc.oneof(
    { weight: 4, arbitrary: nastyJson },
    { weight: 2, arbitrary: fc.constantFrom(...ctx.allIds) },
    { weight: 1, arbitrary: fc.uuid() },
    { weight: 1, arbitrary: fc.array(fc.dictionary(fc.constantFrom('value', 'flag', 'id', 'name'), nastyJson, { maxKeys: 3 }), { maxLength: 12 }) },
  );
}

export function bodyArbitrary(spec: RouteSpec, ctx: FuzzContext): fc.Arbitrary<NonNullable<RouteCase['body']>> {
  const fields = spec.bodyFields ?? [];
  const jsonType = fc.oneof({ weight: 6, arbitrary: fc.constant('application/json') }, { weight: 2, arbitrary: contentType });
  const json = fc.tuple(fc.oneof({ weight: 6, arbitrary: nearMissObject(fields, fieldValue(ctx)) }, { weight: 3, arbitrary: nastyJson }, { weight: 1, arbitrary: deepJson }), jsonType).map(([value, type]) => ({ payload: JSON.stringify(value) ?? 'null', contentType: type }));
  const hostile = fc.tuple(hostileJsonText(fields), jsonType).map(([payload, type]) => ({ payload, contentType: type }));
  const raw = fc.tuple(rawBody, fc.option(contentType, { nil: undefined })).map(([payload, type]) => ({ payload, contentType: type }));
  return fc.oneof({ weight: 6, arbitrary: json }, { weight: 2, arbitrary: hostile }, { weight: 2, arbitrary: raw });
}

function paramArbitrary(spec: RouteSpec, target: DiscoveredTarget, ctx: FuzzContext, wide: boolean): fc.Arbitrary<Record<string, string>> {
  const names = paramNamesOf(target.file).filter((p) => !p.catchAll);
  return fc.record(
    Object.fromEntries(
      names.map(({ name }) => {
        const extra = spec.paramValues?.[name] ?? [];
        // A segment with its own names (a transition) is aimed at those, not at row ids.
        const own = extra.length ? [...extra] : ctx.idsForParam(name);
        // Outside the query dimension most cases name something real, so validation past the lookup is reached.
        const arbitrary = wide ? pathParam(own, extra) : fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...(own.length ? own : ['none'])) }, { weight: 2, arbitrary: extra.length ? fc.constantFrom(...extra) : fc.uuid() }, { weight: 1, arbitrary: pathParam(own, extra) });
        return [name, arbitrary];
      }),
    ) as Record<string, fc.Arbitrary<string>>,
  );
}

function headersArbitrary(ctx: FuzzContext): fc.Arbitrary<[string, string][]> {
  const pair = fc.oneof(
    { weight: 4, arbitrary: fc.tuple(headerName, headerValue) },
    { weight: 2, arbitrary: fc.tuple(fc.constant('cookie'), garbageCookie(ctx.anyCookie)) },
    { weight: 1, arbitrary: fc.tuple(fc.constant('origin'), fc.constantFrom('https://evil.example', 'null', 'http://localhost:3000.evil.example', 'file://', '')) },
    { weight: 1, arbitrary: fc.tuple(fc.constant('content-type'), contentType) },
  );
  return fc.array(pair, { minLength: 1, maxLength: 6 }).filter((pairs) => {
    try {
      new Headers(pairs);
      return true;
    } catch {
      // A value Headers refuses is one no HTTP server would hand to a route.
      return false;
    }
  });
}

export function routeCaseArbitrary(spec: RouteSpec, target: DiscoveredTarget, ctx: FuzzContext, dimension: Dimension): fc.Arbitrary<RouteCase> {
  const withBody = !['GET', 'HEAD'].includes(target.exportName);
  const arbitrary = fc.record({
    caller: fc.constantFrom(...ctx.callerNames),
    params: paramArbitrary(spec, target, ctx, dimension === 'queries'),
    query: dimension === 'queries' ? queryPairs(spec.queryFields ?? []) : fc.constant([] as [string, string][]),
    headers: dimension === 'headers' ? headersArbitrary(ctx) : fc.constant([] as [string, string][]),
    body: withBody ? bodyArbitrary(spec, ctx) : fc.constant(undefined),
  });
  return arbitrary.filter((rc) => isSafeCase(spec, rc, ctx) && !spec.skip?.(rc, ctx));
}

/**
 * Bad input only: a body the target's own schema accepts could legitimately succeed and change the
 * database. Such a body is sent only when the spec says it is harmless without real ids (an id of
 * nothing must still be refused) and neither it nor the path names a real row.
 */
function isSafeCase(spec: RouteSpec, rc: RouteCase, ctx: FuzzContext): boolean {
  if (!spec.accepts || !rc.body) return true;
  // Parsed here rather than kept in the case: a deeply nested value would overflow the report of a failure.
  const parsed = parsedAs(rc.body.payload, rc.body.contentType);
  if (parsed === NOT_JSON || !spec.accepts(parsed, rc.params)) return true;
  return !!spec.acceptedIsSafeWithoutRealIds && !mentionsAny(parsed, ctx.allIdSet) && !mentionsAny(rc.params, ctx.allIdSet);
}

export function buildRequest(target: DiscoveredTarget, rc: RouteCase, ctx: FuzzContext, pathOverride?: string, spec?: RouteSpec): { request: Request; hasSession: boolean } {
  let urlPath = pathOverride ?? urlTemplateOf(target.file);
  for (const [name, value] of Object.entries(rc.params)) urlPath = urlPath.replace(`[${name}]`, encodeURIComponent(value));
  const url = new URL(urlPath, 'http://localhost:3000');
  for (const [key, value] of [...(spec?.baseQuery ?? []), ...rc.query]) url.searchParams.append(key, value);
  const headers = new Headers(spec?.baseHeaders);
  const cookie = ctx.cookieOf(rc.caller);
  if (cookie) headers.set('cookie', cookie);
  if (rc.body?.contentType !== undefined) headers.set('content-type', rc.body.contentType);
  let hasSession = !!cookie;
  for (const [name, value] of rc.headers) {
    if (name.toLowerCase() === 'cookie') {
      // Replaced, not added: a forged cookie next to a real one would still carry the real session.
      headers.set('cookie', value);
      hasSession = false;
    } else headers.append(name, value);
  }
  const request = new Request(url, { method: target.exportName, headers, body: rc.body?.payload, duplex: 'half' } as RequestInit);
  return { request, hasSession };
}

export function queryObject(request: Request): Record<string, string> {
  return Object.fromEntries(new URL(request.url).searchParams);
}

async function judge(spec: RouteSpec, response: Response, request: Request, hasSession: boolean, label: string): Promise<void> {
  if (spec.expect === 'sdk') {
    const text = await response.text();
    const where = `${label} → ${response.status} ${text.slice(0, 300)}`;
    expect(response.status, where).toBeLessThan(500);
    if (request.method !== 'GET') expect(response.status, where).toBeGreaterThanOrEqual(400);
    if (response.status >= 400 && text.length > 0) expect(() => JSON.parse(text), where).not.toThrow();
    return;
  }
  if (spec.expect === 'static') {
    expect(response.status, label).toBe(200);
    return;
  }
  if (!hasSession && spec.requiresSession !== false) {
    const body = await expectClientProblem(response, label);
    expect(body.status, `${label}: no session must be 401`).toBe(401);
    return;
  }
  if (spec.expect === 'read' && response.status >= 200 && response.status < 400) {
    expect(spec.okStatuses ?? [200], label).toContain(response.status);
    expect(response.headers.get('content-type') ?? '', label).not.toMatch(/problem\+json/);
    if (spec.queryAccepts) expect(spec.queryAccepts(queryObject(request)), `${label}: answered 200 to a query its schema refuses`).toBe(true);
    await response.arrayBuffer();
    return;
  }
  await expectClientProblem(response, label);
}

function describeCase(target: DiscoveredTarget, rc: RouteCase): string {
  const body = rc.body ? `${rc.body.contentType ?? '(no type)'} ${typeof rc.body.payload === 'string' ? rc.body.payload.slice(0, 200) : `[${rc.body.payload.length} bytes]`}` : '';
  return `${target.exportName} ${urlTemplateOf(target.file)} as ${rc.caller} params=${JSON.stringify(rc.params).slice(0, 200)} query=${JSON.stringify(rc.query).slice(0, 200)} headers=${JSON.stringify(rc.headers.map(([n, v]) => [n, v.slice(0, 60)]))} body=${body}`;
}

/** One dimension of one route: numRuns generated requests, each judged against the spec. */
export async function fuzzRoute(target: DiscoveredTarget, spec: RouteSpec, ctx: FuzzContext, dimension: Dimension, numRuns: number): Promise<void> {
  const handler = await loadExport<RouteHandler>(target);
  await fuzz(`${target.id} ${dimension}`, routeCaseArbitrary(spec, target, ctx, dimension), numRuns, async (rc) => {
    ctx.consoleErrors(); // whatever an earlier, failed case left behind is not this one's
    const { request, hasSession } = buildRequest(target, rc, ctx, undefined, spec);
    const label = describeCase(target, rc);
    const response = await handler(request, { params: Promise.resolve(rc.params) });
    // First, so a failure shows the logged error rather than only the 500.
    expect(ctx.consoleErrors(), `${label}: logged an unexpected error`).toEqual([]);
    countOutcome(target.id, String(response.status));
    await judge(spec, response, request, hasSession, label);
    countCase(target.id, dimension);
  });
}

export function plannedRoutes(target: DiscoveredTarget, spec: RouteSpec): [Dimension, number][] {
  const withBody = !['GET', 'HEAD'].includes(target.exportName);
  const runs = spec.runs ?? (withBody ? { bodies: 600, queries: 200, headers: 200 } : { queries: 600, headers: 400 });
  return Object.entries(runs) as [Dimension, number][];
}
