import { openDisputeSchema, transitionSchemas } from '@/lib/cases/schemas';
import { z } from 'zod';
import {
  attachmentKinds,
  caseStatuses,
  custodyEventKinds,
  decisionOutcomes,
  disputeGrounds,
  intakeVerdicts,
  measurementPurposes,
  noteVisibilities,
  preparations,
  readingFlags,
  resultBases,
  sampleKinds,
} from '@/db/schema';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { assessmentRules } from '@/lib/rules/to-assessment';
import { assessmentInputSchema, assessmentSchema, type AssessmentInput } from '@/lib/arbitration';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import type { CaseListPage } from '@/lib/dal/cases';
import type { CaseFile } from '@/lib/dal/case-file';
import { AppError, type ErrorCode, type ProblemDetails } from '@/lib/errors';

// The API's contract, generated from the same zod schemas the routes parse with, so the document
// cannot drift from what a route accepts. Response schemas of the data layer, which has no zod
// schemas of its own, are checked against its TypeScript types at compile time instead.

// ---------- Type-level guards against drift ----------

/** Mutual assignability: a field missing, extra or of another type on either side fails. */
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Assert<T extends true> = T;

/** What a value looks like after `Response.json`: dates become ISO strings. */
type Jsonified<T> = T extends Date
  ? string
  : T extends readonly (infer Item)[]
    ? Jsonified<Item>[]
    : T extends object
      ? { [K in keyof T]: Jsonified<T[K]> }
      : T;

// ---------- Shared schemas ----------

const ERROR_CODES = [
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'gone',
  'invalid',
  'unsupported_media_type',
  'payload_too_large',
  'rate_limited',
  'unavailable',
] as const satisfies readonly ErrorCode[];
// A new error code must be documented before it compiles.
type ErrorCodesListed = Assert<Same<(typeof ERROR_CODES)[number], ErrorCode>>;

/** The wrapper's answer to an unexpected failure, which is not an AppError code. */
const INTERNAL = 'internal';

export const problemDetailsSchema = z
    .object({
      type: z.string().describe('A URI naming the kind of problem'),
      title: z.string().describe('A short summary of the kind of problem'),
      status: z.number().int().min(400).max(599).describe('The HTTP status code'),
      detail: z.string().describe('What went wrong this time, in plain words'),
      instance: z.string().optional().describe('The path of the request'),
      code: z.enum([...ERROR_CODES, INTERNAL]).describe('A stable code for programs to branch on'),
      errors: z
        .record(z.string(), z.array(z.string()))
        .optional()
        .describe('Bad fields by path (e.g. "rules.precision.r", "original.readings.0"); "_" is the body itself'),
    })
    .describe('RFC 9457 problem details');
type ProblemDetailsDocumented = Assert<
  Same<z.output<typeof problemDetailsSchema>, Omit<ProblemDetails, 'code'> & { code: ProblemDetails['code'] | typeof INTERNAL }>
>;

const isoDateTime = () => z.iso.datetime({ offset: true });
const tenthMilliC = (what: string) => z.number().int().describe(`${what}, in tenths of m°C (−5123 is −0.5123 °C)`);

// ---------- Cases ----------

const caseListItemSchema = z.object({
  id: z.uuid(),
  number: z.string().describe('Case number, e.g. CS-2025-0042'),
  status: z.enum(caseStatuses),
  supplierName: z.string(),
  farmName: z.string(),
  deliveryReference: z.string(),
  deliveredAt: isoDateTime(),
  verdict: z.enum(intakeVerdicts).nullable().describe('The intake verdict; null while the referee laboratory works blind'),
  valueTenthMilliC: tenthMilliC('The intake result').nullable(),
  amountMinor: z.number().int().nullable().describe('The deduction in minor currency units'),
  currency: z.string(),
  labName: z.string().nullable(),
  openedAt: isoDateTime(),
  dueAt: isoDateTime().nullable().describe('The deadline that matters in the current state'),
  overdue: z.boolean(),
});

export const caseListPageSchema = z
    .object({
      items: z.array(caseListItemSchema),
      total: z.number().int().min(0).describe('Cases matching the filters, over all pages'),
      page: z.number().int().min(1),
      pageSize: z.number().int().min(1),
    })
    .describe('One page of the cases the caller may see');
type CaseListPageDocumented = Assert<Same<z.output<typeof caseListPageSchema>, Jsonified<CaseListPage>>>;

const custodyEntrySchema = z.object({
  id: z.uuid(),
  kind: z.enum(custodyEventKinds),
  at: isoDateTime(),
  organisation: z.string().nullable(),
  location: z.string().nullable(),
  tempTenthMilliC: tenthMilliC('Storage temperature').nullable(),
  sealIntact: z.boolean().nullable(),
  frozen: z.boolean().nullable(),
  note: z.string().nullable(),
});

const caseFileShape = {
  id: z.uuid(),
  number: z.string(),
  status: z.enum(caseStatuses),
  blind: z.boolean().describe('True while the referee laboratory must not see the intake result'),
  openedAt: isoDateTime(),
  grounds: z.array(z.enum(disputeGrounds)),
  explanation: z.string().nullable(),
  remedy: z.string().nullable(),
  deadlines: z.object({
    dispatchDueAt: isoDateTime().nullable(),
    sampleValidUntil: isoDateTime().nullable(),
    decisionDueAt: isoDateTime().nullable(),
  }),
  retestSubmittedAt: isoDateTime().nullable(),
  decidedAt: isoDateTime().nullable(),
  withdrawnAt: isoDateTime().nullable(),
  parties: z.object({
    supplier: z.string().nullable(),
    plant: z.string().nullable(),
    lab: z.string().nullable(),
    board: z.string().nullable(),
  }),
  delivery: z.object({
    id: z.uuid(),
    reference: z.string(),
    farmName: z.string(),
    herdCode: z.string(),
    collectedAt: isoDateTime(),
    receivedAt: isoDateTime(),
    volumeLitres: z.number().int(),
    tanker: z.string(),
    compartment: z.string(),
    receiptTempTenthMilliC: tenthMilliC('Milk temperature at receipt'),
  }),
  intake: z
    .object({
      verdict: z.enum(intakeVerdicts),
      valueTenthMilliC: tenthMilliC('The intake result'),
      limitTenthMilliC: tenthMilliC('The limit applied'),
      decisionRule: z.string(),
      addedWaterBasisPoints: z.number().int().describe('Added water charged, in hundredths of a percent'),
      amountMinor: z.number().int(),
      currency: z.string(),
      decidedAt: isoDateTime(),
      notifiedAt: isoDateTime().nullable(),
    })
    .nullable()
    .describe('Null for the blind referee laboratory'),
  rules: z.object({ version: z.number().int(), name: z.string(), effectiveFrom: isoDateTime() }).nullable(),
  samples: z.array(
    z.object({
      id: z.uuid(),
      code: z.string(),
      kind: z.enum(sampleKinds),
      sealNumber: z.string().nullable(),
      preservative: z.string().nullable(),
      storage: z.string().nullable(),
      sampledAt: isoDateTime(),
      custody: z.array(custodyEntrySchema),
    }),
  ),
  measurementSets: z.array(
    z.object({
      id: z.uuid(),
      purpose: z.enum(measurementPurposes),
      organisationId: z.uuid(),
      laboratory: z.string().nullable(),
      analystName: z.string(),
      testedAt: isoDateTime(),
      sampleTempTenthMilliC: tenthMilliC('Sample temperature at test').nullable(),
      preparation: z.enum(preparations),
      resultTenthMilliC: tenthMilliC('Final result').nullable(),
      resultBasis: z.enum(resultBases).nullable(),
      readingsUsed: z.number().int().nullable(),
      submittedAt: isoDateTime().nullable(),
      instrumentSerial: z.string(),
      calibrationCheckId: z.uuid().nullable(),
      calibrationWarning: z.string().nullable().describe("Why the set was recorded without a passing calibration check, if it was"),
      readings: z.array(
        z.object({ position: z.number().int().min(1), valueTenthMilliC: tenthMilliC('Reading'), flag: z.enum(readingFlags) }),
      ),
    }),
  ),
  notes: z.array(
    z.object({
      id: z.uuid(),
      parentId: z.uuid().nullable(),
      visibility: z.enum(noteVisibilities),
      body: z.unknown().describe('Rich text as editor JSON, checked against the notes schema on write; render it as text, never as HTML'),
      text: z.string().describe('The note as plain text'),
      createdAt: isoDateTime(),
      editedAt: isoDateTime().nullable(),
      authorName: z.string(),
      organisationId: z.uuid(),
      organisation: z.string(),
      mine: z.boolean().describe('Whether the caller wrote it'),
      editableUntil: isoDateTime().nullable().describe('Until when the caller may still edit it; null if the caller may not'),
      revisions: z.array(z.object({ body: z.unknown().describe('The body before an edit'), replacedAt: isoDateTime() })).describe('Earlier bodies, oldest first'),
    }),
  ),
  decisions: z.array(
    z.object({
      id: z.uuid(),
      outcome: z.enum(decisionOutcomes),
      reasons: z.string(),
      followedProposal: z.boolean(),
      departureReason: z.string().nullable(),
      signerName: z.string(),
      signedAt: isoDateTime(),
      signatureMeaning: z.string(),
      recordSha256: z.string().nullable(),
      supersedesId: z.uuid().nullable(),
    }),
  ),
  attachments: z.array(
    z.object({
      id: z.uuid(),
      kind: z.enum(attachmentKinds),
      caption: z.string().nullable(),
      fileName: z.string(),
      contentType: z.string(),
      sizeBytes: z.number().int(),
      sha256: z.string().describe('SHA-256 of the stored bytes, hex'),
      createdAt: isoDateTime(),
      removedAt: isoDateTime().nullable().describe('When the uploading organisation withdrew it; the file stays in the record'),
      removalReason: z.string().nullable(),
      removedByName: z.string().nullable(),
      uploaderName: z.string(),
      organisationId: z.uuid(),
      organisation: z.string(),
      downloadable: z.boolean().describe('Whether the caller may open it: a withdrawn file only the board'),
      hasThumbnail: z.boolean(),
      removable: z.boolean().describe('Whether the caller may withdraw it'),
    }),
  ),
  ledger: z.array(
    z.object({
      seq: z.number().int(),
      at: isoDateTime(),
      action: z.string(),
      change: z.unknown(),
      actorName: z.string().nullable(),
      actorOrganisationId: z.uuid().nullable(),
      actorOrganisation: z.string().nullable(),
    }),
  ),
};

export const caseFileSchema = z.object(caseFileShape).describe('Everything the caller may see of one case');
type CaseFileDocumented = Assert<Same<z.output<typeof caseFileSchema>, Jsonified<CaseFile>>>;

// ---------- The registry of operations ----------

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** A schema that becomes a named entry of components.schemas. */
export type NamedSchema = { name: string; schema: z.ZodType };

export type ApiOperation = {
  method: Method;
  /** OpenAPI path template, e.g. /api/v1/cases/{caseId}. */
  path: string;
  operationId: string;
  summary: string;
  description?: string;
  tag: string;
  /** Answers without a session. */
  public?: boolean;
  pathParams?: z.ZodObject;
  query?: z.ZodObject;
  /** Words for parameters whose schema cannot say them, by parameter name. */
  parameterNotes?: Record<string, string>;
  requestBody?: NamedSchema & { example?: unknown };
  /** A redirect has no body, only headers: name → what it holds. */
  response: { status: number; description: string; body?: NamedSchema; headers?: Record<string, string>; file?: { mediaType: string } };
  /** Expected failures, each answered as problem details. */
  errors: readonly ErrorCode[];
};

/** Invented readings of a disputed delivery, for the documented example. */
const assessmentExample: AssessmentInput = {
  rules: assessmentRules(defaultSchemeRules),
  original: {
    readings: [-0.5112, -0.5118],
    testedAt: '2025-06-02T05:50:00+02:00',
    calibration: { nominal: -0.512, readings: [-0.5122, -0.5118, -0.5125, -0.5119, -0.5121] },
  },
  retest: {
    readings: [-0.5121, -0.5127],
    testedAt: '2025-06-03T09:15:00+02:00',
    calibration: { nominal: -0.512, readings: [-0.5117, -0.5123, -0.512, -0.5124, -0.5118] },
    sample: {
      sampledAt: '2025-06-02T05:20:00+02:00',
      sealIntact: true,
      frozen: false,
      custodyComplete: true,
      storageTemperatures: [4.1, 3.7, 4.4, 3.9],
    },
  },
  intake: { addedWaterPercent: 1.7 },
};

const caseStatusNote = `Comma-separated case states, any of: ${caseStatuses.join(', ')}`;

const openedCaseSchema = z.object({ id: z.uuid(), number: z.string(), status: z.literal('open') });
const transitionOutcomeSchema = z.object({ caseId: z.uuid(), number: z.string(), from: z.string(), to: z.string(), transition: z.string() });

export const operations: ApiOperation[] = [
  {
    method: 'get',
    path: '/api/v1/cases',
    operationId: 'listCases',
    summary: 'List the cases the caller may see',
    description: 'Filtered, sorted and paged. An organisation sees only the cases it is a party to.',
    tag: 'Cases',
    query: caseListQuerySchema,
    parameterNotes: {
      status: caseStatusNote,
      supplier: 'Only cases of this supplier organisation',
      lab: 'Only cases at this referee laboratory',
      overdue: 'Only cases past (true) or within (false) their current deadline',
      q: 'Search in case number, delivery reference, farm and supplier names',
    },
    response: { status: 200, description: 'One page of cases', body: { name: 'CaseListPage', schema: caseListPageSchema } },
    errors: ['invalid', 'unauthenticated', 'forbidden'],
  },
  {
    method: 'get',
    path: '/api/v1/cases/{caseId}',
    operationId: 'getCase',
    summary: 'Read one case file',
    description: 'A case of another organisation answers 404, exactly like a missing one.',
    tag: 'Cases',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    response: { status: 200, description: 'The case file', body: { name: 'CaseFile', schema: caseFileSchema } },
    errors: ['unauthenticated', 'not_found'],
  },
  {
    method: 'post',
    path: '/api/v1/assessments',
    operationId: 'runAssessment',
    summary: 'Propose an outcome for a disputed freezing-point result',
    description:
      'Runs the decision module on the readings, the retained sample and the scheme rules in the body, and returns ' +
      'the proposed outcome with every check explained and sourced. Nothing is stored. The proposal is decision ' +
      'support: the arbiter decides, and local regulations and the supply contract prevail.',
    tag: 'Assessments',
    requestBody: { name: 'AssessmentInput', schema: assessmentInputSchema, example: assessmentExample },
    response: { status: 200, description: 'The proposal', body: { name: 'Assessment', schema: assessmentSchema } },
    errors: ['invalid', 'unsupported_media_type', 'payload_too_large', 'unauthenticated', 'forbidden'],
  },
  {
    method: 'post',
    path: '/api/v1/cases',
    operationId: 'openDispute',
    summary: 'Open a dispute against a rejected or deducted intake result',
    description: 'Suppliers only, for their own deliveries, while the contest window of the scheme rules is open.',
    tag: 'Cases',
    requestBody: { name: 'OpenDispute', schema: openDisputeSchema },
    response: { status: 201, description: 'The new case', body: { name: 'OpenedCase', schema: openedCaseSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'post',
    path: '/api/v1/cases/{caseId}/transitions/dispatch',
    operationId: 'dispatchSample',
    summary: 'The plant dispatches the retained sample to the referee laboratory',
    description: 'Allowed from: open. A stale or repeated submit answers 409 and changes nothing.',
    tag: 'Case lifecycle',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    requestBody: { name: 'DispatchSample', schema: transitionSchemas.dispatch },
    response: { status: 200, description: 'The transition made', body: { name: 'TransitionOutcome', schema: transitionOutcomeSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'post',
    path: '/api/v1/cases/{caseId}/transitions/receive',
    operationId: 'recordReceipt',
    summary: 'The referee laboratory records the sample on receipt',
    description: 'Allowed from: awaiting_sample. A stale or repeated submit answers 409 and changes nothing.',
    tag: 'Case lifecycle',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    requestBody: { name: 'RecordReceipt', schema: transitionSchemas.receive },
    response: { status: 200, description: 'The transition made', body: { name: 'TransitionOutcome', schema: transitionOutcomeSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'post',
    path: '/api/v1/cases/{caseId}/transitions/submit_retest',
    operationId: 'submitRetest',
    summary: 'The referee laboratory submits its calibration check and retest readings',
    description: 'Allowed from: retest. A stale or repeated submit answers 409 and changes nothing.',
    tag: 'Case lifecycle',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    requestBody: { name: 'SubmitRetest', schema: transitionSchemas.submit_retest },
    response: { status: 200, description: 'The transition made', body: { name: 'TransitionOutcome', schema: transitionOutcomeSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'post',
    path: '/api/v1/cases/{caseId}/transitions/order_further_test',
    operationId: 'orderFurtherTest',
    summary: 'The board orders a further test on a new sample',
    description: 'Allowed from: review. A stale or repeated submit answers 409 and changes nothing.',
    tag: 'Case lifecycle',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    requestBody: { name: 'OrderFurtherTest', schema: transitionSchemas.order_further_test },
    response: { status: 200, description: 'The transition made', body: { name: 'TransitionOutcome', schema: transitionOutcomeSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'post',
    path: '/api/v1/cases/{caseId}/transitions/withdraw',
    operationId: 'withdrawDispute',
    summary: 'The supplier withdraws its dispute',
    description: 'Allowed from: open, awaiting_sample, retest, review. A stale or repeated submit answers 409 and changes nothing.',
    tag: 'Case lifecycle',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    requestBody: { name: 'WithdrawDispute', schema: transitionSchemas.withdraw },
    response: { status: 200, description: 'The transition made', body: { name: 'TransitionOutcome', schema: transitionOutcomeSchema } },
    errors: ['invalid', 'unsupported_media_type', 'unauthenticated', 'forbidden', 'not_found', 'conflict'],
  },
  {
    method: 'get',
    path: '/api/v1/cases/{caseId}/letter',
    operationId: 'downloadDecisionLetter',
    summary: 'Download the decision letter',
    description:
      'The sealed decision’s letter as a PDF, for the parties of the case and its board; anyone else gets 404, as for a missing case. ' +
      'Without `decision`, the letter of the decision in force; with it, that decision’s letter, also when a correction has superseded it. ' +
      'A record that no longer matches its seal answers 409 and no letter is issued.',
    tag: 'Decisions',
    pathParams: z.object({ caseId: z.uuid().describe('The case id') }),
    query: z.object({ decision: z.uuid().optional().describe('The id of a decision of this case') }),
    response: { status: 200, description: 'The letter', file: { mediaType: 'application/pdf' }, headers: { 'Content-Disposition': 'attachment, with the case number and the decision in the file name' } },
    errors: ['invalid', 'unauthenticated', 'not_found', 'conflict'],
  },
  {
    method: 'get',
    path: '/api/v1/cases/{caseId}/attachments/{attachmentId}',
    operationId: 'downloadAttachment',
    summary: 'Download one file of evidence',
    description:
      'Redirects to a signed link on the file store, valid for two minutes, served as a download with nosniff. ' +
      'Anyone not on the case, and the referee laboratory asking for another party’s file before it has submitted its retest, ' +
      'gets 404 as for a missing file. A withdrawn file answers 410 to everyone but the board.',
    tag: 'Evidence',
    pathParams: z.object({ caseId: z.uuid().describe('The case id'), attachmentId: z.uuid().describe('The file’s id, from the case file’s attachments') }),
    response: { status: 303, description: 'See the signed link', headers: { Location: 'The signed link to the file; it expires within two minutes' } },
    errors: ['unauthenticated', 'not_found', 'gone', 'unavailable'],
  },
  {
    method: 'get',
    path: '/api/v1/cases/{caseId}/attachments/{attachmentId}/thumbnail',
    operationId: 'downloadAttachmentPreview',
    summary: 'The preview of an image in the evidence',
    description: 'A WebP of at most 320 × 320 px, under the same rules as the file itself; a file without a preview answers 404.',
    tag: 'Evidence',
    pathParams: z.object({ caseId: z.uuid().describe('The case id'), attachmentId: z.uuid().describe('The file’s id') }),
    response: { status: 303, description: 'See the signed link', headers: { Location: 'The signed link to the preview; it expires within two minutes' } },
    errors: ['unauthenticated', 'not_found', 'gone', 'unavailable'],
  },
  {
    method: 'get',
    path: '/api/v1/openapi.json',
    operationId: 'getOpenApiDocument',
    summary: 'This document',
    tag: 'Meta',
    public: true,
    response: {
      status: 200,
      description: 'The OpenAPI 3.1 document of this API',
      body: { name: 'OpenApiDocument', schema: z.looseObject({ openapi: z.string(), info: z.looseObject({}), paths: z.looseObject({}) }) },
    },
    errors: [],
  },
];

// ---------- Building the document ----------

type JsonSchema = Record<string, unknown>;

export type OpenApiDocument = {
  openapi: string;
  info: { title: string; version: string; description: string };
  tags: { name: string }[];
  paths: Record<string, Record<string, unknown>>;
  components: { schemas: Record<string, JsonSchema>; securitySchemes: Record<string, unknown> };
  security: Record<string, string[]>[];
};

const SCHEMA_REF = '#/components/schemas/';
const PROBLEM = 'ProblemDetails';
const SESSION = 'sessionCookie';

/**
 * A decimal step such as 0.0001 cannot be checked with binary floats: −0.5123 / 0.0001 is
 * −5122.999…, so a JSON Schema validator would refuse a valid reading. The step goes into words.
 */
function decimalStepInWords({ zodSchema, jsonSchema }: { zodSchema: unknown; jsonSchema: JsonSchema }): void {
  // Dates travel as ISO 8601 strings; the routes coerce them.
  if ((zodSchema as { _zod?: { def?: { type?: string } } })._zod?.def?.type === 'date') {
    jsonSchema.type = 'string';
    jsonSchema.format = 'date-time';
    return;
  }
  const step = jsonSchema.multipleOf;
  if (typeof step !== 'number' || Number.isInteger(step)) return;
  delete jsonSchema.multipleOf;
  const words = `at most ${Math.round(-Math.log10(step))} decimals`;
  const { description } = jsonSchema;
  jsonSchema.description = typeof description === 'string' ? `${description}; ${words}` : `A${words.slice(1)}`;
}

/**
 * One registry per direction: a request is documented as what may be sent (defaults optional,
 * coercions as their input), a response as what is sent.
 */
function componentSchemas(named: NamedSchema[], io: 'input' | 'output'): Record<string, JsonSchema> {
  const registry = z.registry<{ id: string }>();
  for (const { name, schema } of named) {
    if (!registry.has(schema)) registry.add(schema, { id: name });
  }
  const { schemas } = z.toJSONSchema(registry, {
    target: 'draft-2020-12',
    io,
    uri: (id) => SCHEMA_REF + id,
    unrepresentable: 'any',
    override: decimalStepInWords,
  });
  const result: Record<string, JsonSchema> = {};
  for (const [name, schema] of Object.entries(schemas)) {
    // Components live inside the document: an own $id or dialect per schema would only confuse resolvers.
    const { $id: _id, $schema: _dialect, ...rest } = schema as JsonSchema;
    result[name] = rest;
  }
  return result;
}

function parameters(where: 'path' | 'query', schema: z.ZodObject, notes: Record<string, string> = {}) {
  const json = z.toJSONSchema(schema, { target: 'draft-2020-12', io: 'input', unrepresentable: 'any', override: decimalStepInWords }) as {
    properties?: Record<string, JsonSchema>;
    required?: string[];
  };
  const required = new Set(json.required ?? []);
  return Object.entries(json.properties ?? {}).map(([name, property]) => {
    const { description, ...propertySchema } = property;
    const words = notes[name] ?? description;
    return {
      name,
      in: where,
      required: where === 'path' || required.has(name),
      ...(typeof words === 'string' ? { description: words } : {}),
      schema: propertySchema,
    };
  });
}

function problemResponse(description: string) {
  return { description, content: { 'application/problem+json': { schema: { $ref: SCHEMA_REF + PROBLEM } } } };
}

function operationObject(operation: ApiOperation): Record<string, unknown> {
  const responses: Record<string, unknown> = {
    [operation.response.status]: {
      description: operation.response.description,
      ...(operation.response.body ? { content: { 'application/json': { schema: { $ref: SCHEMA_REF + operation.response.body.name } } } } : {}),
      ...(operation.response.file ? { content: { [operation.response.file.mediaType]: { schema: { type: 'string', format: 'binary' } } } } : {}),
      ...(operation.response.headers
        ? { headers: Object.fromEntries(Object.entries(operation.response.headers).map(([name, description]) => [name, { description, schema: { type: 'string' } }])) }
        : {}),
    },
  };
  for (const code of operation.errors) {
    const sample = new AppError(code, '');
    responses[sample.status] = problemResponse(sample.title);
  }
  responses['500'] = problemResponse('Internal error; nothing was changed');

  const params = [
    ...(operation.pathParams ? parameters('path', operation.pathParams) : []),
    ...(operation.query ? parameters('query', operation.query, operation.parameterNotes) : []),
  ];
  return {
    operationId: operation.operationId,
    summary: operation.summary,
    ...(operation.description ? { description: operation.description } : {}),
    tags: [operation.tag],
    ...(operation.public ? { security: [] } : {}),
    ...(params.length ? { parameters: params } : {}),
    ...(operation.requestBody
      ? {
          requestBody: {
            required: true,
            content: {
              'application/json': {
                schema: { $ref: SCHEMA_REF + operation.requestBody.name },
                ...(operation.requestBody.example === undefined ? {} : { example: operation.requestBody.example }),
              },
            },
          },
        }
      : {}),
    responses,
  };
}

/** The OpenAPI 3.1 document of the given operations. Pure; build it once and cache it. */
export function buildOpenApiDocument(list: readonly ApiOperation[] = operations): OpenApiDocument {
  const inputs: NamedSchema[] = [];
  const outputs: NamedSchema[] = [{ name: PROBLEM, schema: problemDetailsSchema }];
  const seen = new Map<string, z.ZodType>([[PROBLEM, problemDetailsSchema]]);
  const claim = (entry: NamedSchema, into: NamedSchema[]) => {
    const earlier = seen.get(entry.name);
    if (earlier !== undefined && earlier !== entry.schema) {
      throw new Error(`OpenAPI: two different schemas are both named ${entry.name}`);
    }
    seen.set(entry.name, entry.schema);
    if (!into.some((known) => known.name === entry.name)) into.push(entry);
  };

  const paths: OpenApiDocument['paths'] = {};
  for (const operation of list) {
    const item = (paths[operation.path] ??= {});
    if (item[operation.method]) throw new Error(`OpenAPI: ${operation.method} ${operation.path} is listed twice`);
    if (operation.requestBody) claim(operation.requestBody, inputs);
    if (operation.response.body) claim(operation.response.body, outputs);
    item[operation.method] = operationObject(operation);
  }

  const schemas = { ...componentSchemas(inputs, 'input'), ...componentSchemas(outputs, 'output') };
  const tags = [...new Set(list.map((operation) => operation.tag))].map((name) => ({ name }));

  return {
    openapi: '3.1.1',
    info: {
      title: 'Countersample API',
      version: '1',
      description:
        'Cases of disputed freezing-point results of raw milk deliveries, and the decision module that proposes ' +
        'an outcome. Errors are RFC 9457 problem details. Sign in to get the session cookie.',
    },
    tags,
    paths,
    components: {
      schemas,
      securitySchemes: {
        [SESSION]: {
          type: 'apiKey',
          in: 'cookie',
          name: 'better-auth.session_token',
          description: 'The session cookie set at sign-in; over HTTPS it is named __Secure-better-auth.session_token.',
        },
      },
    },
    security: [{ [SESSION]: [] }],
  };
}

let built: OpenApiDocument | undefined;

/** The document of the registered operations, built on first use: the schemas do not change at run time. */
export function openApiDocument(): OpenApiDocument {
  built ??= buildOpenApiDocument();
  return built;
}
