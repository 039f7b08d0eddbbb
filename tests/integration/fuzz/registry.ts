import fc from 'fast-check';
import type { z } from 'zod';
import { assessmentInputSchema } from '@/lib/arbitration';
import { transitionSchemas } from '@/lib/cases/schemas';
import { openDisputeSchema } from '@/lib/cases/schemas';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import { isTransitionName, transitionNames } from '@/lib/cases/lifecycle';
import { publishRulesSchema } from '@/lib/intake/rules-input';
import { addInstrumentSchema, calibrationCheckInputSchema, correctionInputSchema, intakeInputSchema } from '@/lib/intake/schemas';
import { acceptInvitationSchema } from '@/lib/auth/schemas';
import { correctDecisionSchema, signDecisionSchema } from '@/lib/decision/schemas';
import { editNoteSchema, newNoteSchema, replySchema } from '@/lib/notes/schemas';
import { removeAttachmentSchema } from '@/lib/evidence/schemas';
import { endOtherSessionsSchema, endSessionSchema } from '@/app/(app)/account/schema';
import { addOrganisationSchema } from '@/app/(app)/admin/organisations/schema';
import { inviteSchema, revokeInvitationSchema } from '@/app/(app)/admin/users/schema';
import type { Dimension } from './harness';
import type { RouteCase } from './route-fuzz';
import { nastyJson, nearMissObject, pathParam, structuredValue } from './arbitraries';

/**
 * Every route handler and server action, with what its bad-input fuzzing expects. The coverage test
 * fails for a discovered target with no line here; a new one usually needs one line, e.g.
 *   'app/api/v1/cases/[caseId]/widgets/route.ts#POST': write('api', { schema: widgetSchema }),
 */

export type FuzzContext = {
  /** 'anonymous' and one signed-in caller per demo account. */
  callerNames: string[];
  cookieOf(caller: string): string | undefined;
  /** A real cookie, to forge others from. */
  anyCookie: string;
  ids: Record<string, string[]>;
  allIds: string[];
  allIdSet: Set<string>;
  idsForParam(name: string): string[];
  /** Errors logged since the last call. */
  consoleErrors(): string[];
};

/**
 * What a schema-accepted input may do. 'refuse': never sent, it could succeed. 'withoutRealIds': sent
 * only naming no real row, and must still be refused (an id of nothing is a 404). 'always': sent
 * as it comes, because it cannot change anything (a read, a password that is never right).
 */
export type Accepted = 'refuse' | 'withoutRealIds' | 'always';

export type RouteSpec = {
  kind: 'route';
  group: 'api' | 'auth' | 'sdk';
  /**
   * write: always a 4xx problem; read: 200 or a 4xx problem; static: 200 whatever comes; auth:
   * better-auth's own; sdk: a library's handler with its own JSON errors (never a 5xx, writes 4xx).
   */
  expect: 'write' | 'read' | 'static' | 'auth' | 'sdk';
  requiresSession?: boolean;
  bodyFields?: readonly string[];
  accepts?: (body: unknown, params: Record<string, string>) => boolean;
  acceptedIsSafeWithoutRealIds?: boolean;
  queryFields?: readonly string[];
  queryAccepts?: (query: Record<string, string>) => boolean;
  paramValues?: Record<string, readonly string[]>;
  /** Sent with every case before the generated parts, to get past a gate that is not under test. */
  baseQuery?: [string, string][];
  baseHeaders?: [string, string][];
  /** Statuses of a read's success; 200 unless said. */
  okStatuses?: readonly number[];
  /** Cases not worth running (valid and slow); they are not generated, so not counted either. */
  skip?: (rc: RouteCase, ctx: FuzzContext) => boolean;
  runs?: Partial<Record<Dimension, number>>;
};

export type ActionSpec = {
  kind: 'action';
  group: 'form-actions' | 'value-actions';
  /** form: (previous, FormData); formData: (FormData); values: (values); args: positional, from `args`. */
  style: 'form' | 'formData' | 'values' | 'args';
  fields: readonly string[];
  accepts?: (input: unknown) => boolean;
  accepted?: Accepted;
  args?: (ctx: FuzzContext) => fc.Arbitrary<unknown[]>;
  /** True for arguments that could succeed: never sent. */
  argsUnsafe?: (args: unknown[], ctx: FuzzContext) => boolean;
  /** Needs no session (accepting an invitation, checking a letter). */
  anonymous?: boolean;
  /** A success that changes nothing whatever the input, e.g. "There was no other session." */
  noOpSuccess?: RegExp;
  /** A state other than FormState: judged by the entry itself. */
  judge?: (state: unknown, label: string) => void;
  runs?: Partial<Record<Dimension, number>>;
};

export type FuzzSpec = RouteSpec | ActionSpec;

/** Field names of a zod object schema, also behind refinements and pipes. */
export function fieldsOf(schema: z.ZodType): string[] {
  let current: unknown = schema;
  for (let i = 0; i < 5 && current; i++) {
    const shape = (current as { shape?: Record<string, unknown> }).shape;
    if (shape && typeof shape === 'object') return Object.keys(shape);
    const def = (current as { def?: { in?: unknown; schema?: unknown; innerType?: unknown; left?: unknown } }).def;
    current = def?.in ?? def?.schema ?? def?.innerType ?? def?.left;
  }
  return [];
}

const takes = (schema: z.ZodType) => (value: unknown) => {
  try {
    return schema.safeParse(value).success;
  } catch {
    return false;
  }
};

function write(group: RouteSpec['group'], options: Omit<RouteSpec, 'kind' | 'group' | 'expect'> & { schema?: z.ZodType } = {}): RouteSpec {
  const { schema, ...rest } = options;
  return { kind: 'route', group, expect: 'write', ...(schema ? { bodyFields: fieldsOf(schema), accepts: takes(schema) } : {}), ...rest };
}

function read(group: RouteSpec['group'], options: Omit<RouteSpec, 'kind' | 'group' | 'expect'> & { query?: z.ZodType } = {}): RouteSpec {
  const { query, ...rest } = options;
  return { kind: 'route', group, expect: 'read', ...(query ? { queryFields: fieldsOf(query), queryAccepts: takes(query) } : {}), ...rest };
}

const publicDocument = (): RouteSpec => ({ kind: 'route', group: 'api', expect: 'static', requiresSession: false, runs: { queries: 500, headers: 500 } });

function formAction(schema: z.ZodType, accepted: Accepted = 'refuse', extra: Partial<ActionSpec> = {}): ActionSpec {
  return { kind: 'action', group: 'form-actions', style: 'form', fields: fieldsOf(schema), accepts: takes(schema), accepted, ...extra };
}

function valuesAction(schema: z.ZodType, accepted: Accepted = 'refuse', extra: Partial<ActionSpec> = {}): ActionSpec {
  return { kind: 'action', group: 'value-actions', style: 'values', fields: fieldsOf(schema), accepts: takes(schema), accepted, ...extra };
}

const transitionFields = [...new Set(Object.values(transitionSchemas).flatMap(fieldsOf))];
const transitionAccepts = (body: unknown, name: unknown) => typeof name === 'string' && isTransitionName(name) && takes(transitionSchemas[name])(body);

export const registry: Record<string, FuzzSpec> = {
  'app/.well-known/countersample-signing-key/route.ts#GET': publicDocument(),
  'app/api/v1/openapi.json/route.ts#GET': publicDocument(),
  'app/api/auth/[...all]/route.ts#GET': { kind: 'route', group: 'auth', expect: 'auth' },
  'app/api/auth/[...all]/route.ts#POST': { kind: 'route', group: 'auth', expect: 'auth' },
  // Nothing is stored, but an accepted body answers 200: only refused bodies are sent.
  'app/api/v1/assessments/route.ts#POST': write('api', { schema: assessmentInputSchema }),
  // No session here: loopback and the start-up token, so every generated request is refused.
  // The loopback headers get a case past the first gate to the token check; generated headers can still spoil them.
  'app/api/internal/backup/route.ts#POST': write('api', { requiresSession: false, baseHeaders: [['host', '127.0.0.1:3000'], ['x-forwarded-for', '127.0.0.1']] }),
  'app/api/v1/cases/route.ts#GET': read('api', { query: caseListQuerySchema }),
  'app/api/v1/cases/route.ts#POST': write('api', { schema: openDisputeSchema, acceptedIsSafeWithoutRealIds: true }),
  'app/api/v1/cases/[caseId]/route.ts#GET': read('api'),
  // A file of evidence answers a party with a 303 to a short-lived signed link.
  'app/api/v1/cases/[caseId]/attachments/[attachmentId]/route.ts#GET': read('api', { okStatuses: [303] }),
  'app/api/v1/cases/[caseId]/attachments/[attachmentId]/thumbnail/route.ts#GET': read('api', { okStatuses: [303] }),
  'app/api/v1/cases/[caseId]/letter/route.ts#GET': read('api', {
    queryFields: ['decision'],
    // A party's plain request for a decided case's letter is a valid download that takes seconds to
    // render (the decision-letter tests cover it); here it would only crowd out bad input.
    skip: (rc, ctx) => (ctx.ids.decision_case ?? []).includes(rc.params.caseId) && !new URLSearchParams(rc.query).has('decision'),
  }),
  'app/api/v1/cases/[caseId]/transitions/[transition]/route.ts#POST': write('api', {
    bodyFields: transitionFields,
    accepts: (body, params) => transitionAccepts(body, params.transition),
    acceptedIsSafeWithoutRealIds: true,
    paramValues: { transition: transitionNames },
  }),

  'app/(app)/account/actions.ts#endSessionAction': formAction(endSessionSchema, 'always', {
    // Each caller holds exactly one session, its own: another's id is a 404, its own a 409.
  }),
  'app/(app)/account/actions.ts#endOtherSessionsAction': formAction(endOtherSessionsSchema, 'always', { noOpSuccess: /^There was no other session\.$/ }),
  'app/(app)/admin/organisations/actions.ts#addOrganisationAction': formAction(addOrganisationSchema),
  'app/(app)/admin/users/actions.ts#inviteAction': formAction(inviteSchema, 'withoutRealIds'),
  'app/(app)/admin/users/actions.ts#revokeInvitationAction': formAction(revokeInvitationSchema, 'withoutRealIds'),
  // Invitation tokens are random secrets no generator reproduces, so any accepted form names nothing.
  'app/(auth)/invitation/[token]/actions.ts#acceptInvitationAction': formAction(acceptInvitationSchema, 'always', { anonymous: true }),
  'app/verify/actions.ts#checkLetter': {
    kind: 'action',
    group: 'form-actions',
    style: 'formData',
    fields: ['fileSha256', 'embeddedRecordSha256', 'file'],
    accepted: 'always',
    anonymous: true,
    judge: (state, label) => {
      const s = state as { ok: boolean; message?: string; check?: { byFile: { found: boolean }; byEmbeddedHash: { found: boolean } | null } };
      if (!s || typeof s !== 'object') throw new Error(`${label}: answered ${String(state)}`);
      if (s.ok) {
        // A read: garbage finds no sealed decision, and says so rather than failing.
        if (s.check?.byFile.found !== false || (s.check.byEmbeddedHash && s.check.byEmbeddedHash.found !== false)) throw new Error(`${label}: a garbage letter matched a decision`);
      } else if (typeof s.message !== 'string' || !s.message || /went wrong on our side/.test(s.message)) throw new Error(`${label}: ${JSON.stringify(s)}`);
    },
  },

  'app/(app)/admin/rules/actions.ts#publishRulesAction': valuesAction(publishRulesSchema),
  'app/(app)/deliveries/[deliveryId]/actions.ts#correctIntakeAction': valuesAction(correctionInputSchema, 'withoutRealIds'),
  'app/(app)/deliveries/[deliveryId]/dispute/actions.ts#openDisputeAction': valuesAction(openDisputeSchema, 'withoutRealIds'),
  'app/(app)/cases/[caseId]/evidence-actions.ts#withdrawEvidence': valuesAction(removeAttachmentSchema, 'withoutRealIds'),
  'app/(app)/instruments/actions.ts#addInstrumentAction': valuesAction(addInstrumentSchema),
  'app/(app)/instruments/actions.ts#recordCalibrationCheckAction': valuesAction(calibrationCheckInputSchema, 'withoutRealIds'),
  'app/(app)/intake/actions.ts#recordIntakeAction': valuesAction(intakeInputSchema, 'withoutRealIds'),
  'app/(app)/cases/[caseId]/actions.ts#transitionCase': {
    kind: 'action',
    group: 'value-actions',
    style: 'args',
    fields: transitionFields,
    args: (ctx) => caseArgs(ctx, [fieldArg('name', [...transitionNames]), valuesArg(transitionFields), fieldArg('seen', ['submitted', 'review', 'decided', 'dispatched'])]),
    // A transition the schema accepts is sent only for a case id of nothing: it must be a 404.
    argsUnsafe: ([caseId, name, values], ctx) => transitionAccepts(values, name) && typeof caseId === 'string' && ctx.allIdSet.has(caseId),
  },
  'app/(app)/cases/[caseId]/decision/actions.ts#correctCaseDecision': {
    kind: 'action',
    group: 'value-actions',
    style: 'args',
    fields: fieldsOf(correctDecisionSchema(null)),
    // As for signing: the password is never right, so nothing can be sealed.
    args: (ctx) => caseArgs(ctx, [valuesArg(fieldsOf(correctDecisionSchema(null)))]),
  },
  'app/(app)/cases/[caseId]/notes-actions.ts#postNoteAction': noteAction(newNoteSchema, []),
  'app/(app)/cases/[caseId]/notes-actions.ts#replyToNoteAction': noteAction(replySchema, ['note']),
  'app/(app)/cases/[caseId]/notes-actions.ts#editNoteAction': noteAction(editNoteSchema, ['note']),
  // The UploadThing SDK answers in its own JSON format; its config GET is public.
  'app/api/uploadthing/route.ts#GET': { kind: 'route', group: 'sdk', expect: 'sdk', requiresSession: false },
  'app/api/uploadthing/route.ts#POST': {
    kind: 'route',
    group: 'sdk',
    expect: 'sdk',
    requiresSession: false,
    // An upload request names its route and action in the query; without them the SDK refuses before any of our code runs.
    baseQuery: [['actionType', 'upload'], ['slug', 'photo']],
    baseHeaders: [['x-uploadthing-package', 'react'], ['x-uploadthing-version', '7.7.4']],
    bodyFields: ['files', 'input'],
    queryFields: ['actionType', 'slug'],
  },
  'app/(app)/cases/[caseId]/decision/actions.ts#signCaseDecision': {
    kind: 'action',
    group: 'value-actions',
    style: 'args',
    fields: fieldsOf(signDecisionSchema(null)),
    // The generated password is never the account's, so even an accepted form is refused at re-authentication.
    args: (ctx) => caseArgs(ctx, [valuesArg(fieldsOf(signDecisionSchema(null)))]),
  },
};

/** Positional arguments of the case actions: a case id (or not even a string), then the rest. */
function caseArgs(ctx: FuzzContext, parts: ({ name: string; values: string[] } | { fields: readonly string[] })[]): fc.Arbitrary<unknown[]> {
  const caseId = fc.oneof({ weight: 6, arbitrary: pathParam(ctx.ids.dispute_case ?? [], []) }, { weight: 1, arbitrary: structuredValue([], ctx.allIds) });
  const rest = parts.map((part) => ('fields' in part ? structuredValue(part.fields, ctx.allIds) : fc.oneof({ weight: 3, arbitrary: fc.constantFrom(...part.values) }, { weight: 1, arbitrary: structuredValue([], ctx.allIds) })));
  return fc.tuple(caseId, ...rest);
}
const fieldArg = (name: string, values: string[]) => ({ name, values });
const valuesArg = (fields: readonly string[]) => ({ fields });

/** A rich-text document that is almost right: the shape the note editor sends, with hostile parts. */
function noteDoc(ctx: FuzzContext): fc.Arbitrary<unknown> {
  const text = fc.oneof(nastyJson, fc.string());
  const mark = fc.record({ type: fc.constantFrom('bold', 'italic', 'link', 'code', 'script', '__proto__'), attrs: fc.option(fc.record({ href: fc.constantFrom('javascript:alert(1)', 'data:text/html,x', '//evil.example', 'https://ok.example', '') }), { nil: undefined }) });
  const inline = fc.oneof(
    fc.record({ type: fc.constant('text'), text, marks: fc.option(fc.array(mark, { maxLength: 3 }), { nil: undefined }) }),
    fc.record({ type: fc.constant('mention'), attrs: fc.record({ id: fc.oneof(fc.constantFrom(...ctx.allIds), fc.uuid(), text), label: text }) }),
    fc.record({ type: fc.oneof(fc.constantFrom('image', 'iframe', 'hardBreak', 'paragraph'), fc.string()), attrs: nastyJson }),
  );
  const block = fc.record({ type: fc.constantFrom('paragraph', 'heading', 'bulletList', 'orderedList', 'blockquote', 'codeBlock', 'table', 'doc'), attrs: fc.option(nastyJson, { nil: undefined }), content: fc.array(inline, { maxLength: 6 }) });
  return fc.record({ type: fc.constantFrom('doc', 'Doc', 'paragraph', ''), content: fc.oneof(fc.array(block, { maxLength: 6 }), nastyJson) });
}

/**
 * Note actions take (caseId, [parentId | noteId,] values). Every success needs a real case, so a
 * body the schema takes is sent only with a case id of nothing.
 */
function noteAction(schema: z.ZodType, idTables: string[]): ActionSpec {
  const fields = fieldsOf(schema);
  return {
    kind: 'action',
    group: 'value-actions',
    style: 'args',
    fields,
    args: (ctx) => {
      const caseId = fc.oneof({ weight: 6, arbitrary: pathParam(ctx.ids.dispute_case ?? [], []) }, { weight: 1, arbitrary: structuredValue([], ctx.allIds) });
      const ids = idTables.map((table) => pathParam(ctx.ids[table] ?? [], []));
      const body = fc.oneof({ weight: 3, arbitrary: nearMissObject(fields, fc.oneof(noteDoc(ctx), fc.constantFrom('parties', 'internal', 'organisation', 'everyone'), nastyJson)) }, { weight: 1, arbitrary: structuredValue(fields, ctx.allIds) });
      return fc.tuple(caseId, ...ids, body);
    },
    argsUnsafe: (args, ctx) => takes(schema)(args[args.length - 1]) && typeof args[0] === 'string' && ctx.allIdSet.has(args[0]),
  };
}
