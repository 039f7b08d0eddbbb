import { expect } from 'vitest';
import fc from 'fast-check';
import { contentType, garbageCookie, headerName, headerValue, nastyString, protoKey, structuredValue } from './arbitraries';
import { countCase, countOutcome, fuzz, mentionsAny, type Dimension } from './harness';
import { requestState } from './next-stubs';
import { loadExport } from './route-fuzz';
import type { DiscoveredTarget } from './discover';
import type { ActionSpec, FuzzContext } from './registry';

type ActionCase = { caller: string; cookie?: string; headers: [string, string][]; args: unknown[]; describe: string };

const LETTER_LIMIT_BYTES = 10 * 1024 * 1024;

const fileEntry = fc
  .record({
    bytes: fc.oneof(
      { weight: 6, arbitrary: fc.uint8Array({ maxLength: 2_048 }) },
      { weight: 2, arbitrary: fc.constant(new TextEncoder().encode('%PDF-1.7\n%âãÏÓ\n1 0 obj<<>>endobj\n%%EOF')) },
      // Just over the largest letter a reader may upload, made once per case rather than byte by byte.
      { weight: 1, arbitrary: fc.constant(null) },
    ),
    name: fc.oneof(fc.string(), fc.constantFrom('../../etc/passwd', 'letter.pdf', '', 'a'.repeat(300), 'x.pdf\u0000.exe', 'CON')),
    type: contentType,
  })
  .map(({ bytes, name, type }) => new File([bytes ?? new Uint8Array(LETTER_LIMIT_BYTES + 1)], name, { type }));

function formEntries(spec: ActionSpec, ctx: FuzzContext, dimension: Dimension): fc.Arbitrary<[string, string | File][]> {
  const name = fc.oneof(
    { weight: spec.fields.length ? 6 : 0, arbitrary: spec.fields.length ? fc.constantFrom(...spec.fields) : fc.constant('x') },
    { weight: 1, arbitrary: fc.string() },
    { weight: 1, arbitrary: protoKey },
  );
  const text = fc.oneof(
    { weight: 6, arbitrary: nastyString },
    { weight: 2, arbitrary: fc.constantFrom(...ctx.allIds) },
    { weight: 1, arbitrary: fc.stringMatching(/^[0-9a-fA-F]{64}$/) },
    { weight: 1, arbitrary: fc.constantFrom('on', 'true', 'supplier', 'admin', 'lab', 'plant', 'arbiter', 'board') },
  );
  const value = dimension === 'files' ? fc.oneof({ weight: 3, arbitrary: fileEntry }, { weight: 1, arbitrary: text }) : fc.oneof({ weight: 8, arbitrary: text }, { weight: 1, arbitrary: fileEntry });
  return fc.array(fc.tuple(name, value), { minLength: dimension === 'files' ? 1 : 0, maxLength: 10 });
}

function toFormData(entries: [string, string | File][]): FormData {
  const data = new FormData();
  for (const [name, value] of entries) data.append(name, value);
  return data;
}

/** Bad input only, by the entry's rule for inputs its schema would take (see Accepted in the registry). */
function isSafe(spec: ActionSpec, input: unknown, ctx: FuzzContext): boolean {
  if (spec.accepted === 'always' || !spec.accepts) return true;
  if (!spec.accepts(input)) return true;
  return spec.accepted === 'withoutRealIds' && !mentionsAny(input, ctx.allIdSet);
}

function argsArbitrary(spec: ActionSpec, ctx: FuzzContext, dimension: Dimension): fc.Arbitrary<{ args: unknown[]; describe: string }> {
  if (spec.style === 'form' || spec.style === 'formData') {
    return formEntries(spec, ctx, dimension)
      .filter((entries) => isSafe(spec, Object.fromEntries(toFormData(entries)), ctx))
      .chain((entries) =>
        fc.constantFrom<unknown>(null, { ok: true, message: 'Saved.' }, { ok: false, message: 'x', values: { __proto__: 'y' } }).map((previous) => {
          const data = toFormData(entries);
          const describe = JSON.stringify(entries.map(([n, v]) => [n, typeof v === 'string' ? v.slice(0, 80) : `File(${v.name.slice(0, 40)}, ${v.size} bytes, ${v.type})`]));
          return { args: spec.style === 'form' ? [previous, data] : [data], describe };
        }),
      );
  }
  const args = spec.style === 'args' && spec.args ? spec.args(ctx) : structuredValue(spec.fields, ctx.allIds).map((v) => [v]);
  return args
    .filter((a) => (spec.style === 'args' ? !spec.argsUnsafe?.(a, ctx) : isSafe(spec, a[0], ctx)))
    .map((a) => ({ args: a, describe: safeDescribe(a) }));
}

function safeDescribe(value: unknown): string {
  try {
    return JSON.stringify(value, (_k, v: unknown) => (typeof v === 'bigint' ? `${v}n` : typeof v === 'string' ? v.slice(0, 80) : v))?.slice(0, 600) ?? String(value);
  } catch {
    try {
      return String(value).slice(0, 600);
    } catch {
      return Object.prototype.toString.call(value); // { toString: 0 } cannot even be made a string
    }
  }
}

function actionCaseArbitrary(spec: ActionSpec, ctx: FuzzContext, dimension: Dimension): fc.Arbitrary<ActionCase> {
  const caller =
    dimension === 'sessions'
      ? fc.oneof(fc.constant({ caller: 'anonymous', cookie: undefined as string | undefined }), garbageCookie(ctx.anyCookie).map((cookie) => ({ caller: 'forged', cookie })))
      : fc.constantFrom(...ctx.callerNames).map((name) => ({ caller: name, cookie: ctx.cookieOf(name) }));
  const headers =
    dimension === 'sessions'
      ? fc.array(fc.tuple(headerName.filter((n) => n.toLowerCase() !== 'cookie'), headerValue), { maxLength: 4 }).filter((pairs) => {
          try {
            new Headers(pairs);
            return true;
          } catch {
            return false;
          }
        })
      : fc.constant([] as [string, string][]);
  return fc.record({ who: caller, headers, input: argsArbitrary(spec, ctx, dimension) }).map(({ who, headers: extra, input }) => ({ ...who, headers: extra, args: input.args, describe: input.describe }));
}

function judgeState(spec: ActionSpec, state: unknown, hasSession: boolean, label: string): boolean {
  if (spec.judge) {
    spec.judge(state, label);
    return false;
  }
  expect(state !== null && typeof state === 'object', `${label}: answered ${String(state)}`).toBe(true);
  const s = state as { ok: unknown; message: unknown; fieldErrors?: Record<string, unknown> };
  const noOp = !!spec.noOpSuccess && s.ok === true && typeof s.message === 'string' && spec.noOpSuccess.test(s.message);
  if (!noOp) expect(s.ok, `${label}: ${safeDescribe(state)}`).toBe(false);
  expect(typeof s.message === 'string' && s.message.length > 0, `${label}: no message`).toBe(true);
  expect(s.message, `${label}: an unexpected error reached the form`).not.toMatch(/went wrong on our side/);
  if (s.fieldErrors !== undefined) {
    for (const [field, messages] of Object.entries(s.fieldErrors)) {
      expect(Array.isArray(messages) && messages.length > 0 && messages.every((m) => typeof m === 'string' && m.length > 0), `${label}: field errors of ${field}`).toBe(true);
    }
  }
  if (!hasSession && !spec.anonymous) expect(s.message, label).toMatch(/session has ended/i);
  return noOp;
}

export async function fuzzAction(target: DiscoveredTarget, spec: ActionSpec, ctx: FuzzContext, dimension: Dimension, numRuns: number): Promise<void> {
  const action = await loadExport<(...args: unknown[]) => Promise<unknown>>(target);
  await fuzz(`${target.id} ${dimension}`, actionCaseArbitrary(spec, ctx, dimension), numRuns, async (ac) => {
    ctx.consoleErrors(); // whatever an earlier, failed case left behind is not this one's
    const headers = new Headers(ac.headers);
    if (ac.cookie) headers.set('cookie', ac.cookie);
    requestState.headers = headers;
    requestState.revalidated = [];
    requestState.navigations = [];
    const label = `${target.id} as ${ac.caller} with ${ac.describe}`;
    const state = await action(...ac.args);
    const hasSession = dimension !== 'sessions' && ac.caller !== 'anonymous';
    // First, so a failure shows the logged error rather than only the form's "went wrong".
    expect(ctx.consoleErrors(), `${label}: logged an unexpected error`).toEqual([]);
    const noOp = judgeState(spec, state, hasSession, label);
    countOutcome(target.id, outcomeOf(state));
    expect(requestState.navigations, `${label}: redirected as after a success`).toEqual([]);
    if (!noOp) expect(requestState.revalidated, `${label}: revalidated as after a change`).toEqual([]);
    countCase(target.id, dimension);
  });
}

export function plannedActions(spec: ActionSpec): [Dimension, number][] {
  const form = spec.style === 'form' || spec.style === 'formData';
  const runs = spec.runs ?? (form ? { fields: 600, files: 200, sessions: 200 } : { [spec.style === 'args' ? 'args' : 'values']: 750, sessions: 250 });
  return Object.entries(runs) as [Dimension, number][];
}

function outcomeOf(state: unknown): string {
  const s = (state ?? {}) as { ok?: boolean; message?: string; fieldErrors?: object };
  if (s.ok) return 'ok (changes nothing)';
  if (/session has ended/i.test(s.message ?? '')) return 'no session';
  if (s.fieldErrors && Object.keys(s.fieldErrors).length) return 'field errors';
  return 'refused with a message';
}
