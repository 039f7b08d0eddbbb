import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import fc from 'fast-check';
import { getDb } from '@/db/client';
import { createOrganisation, createUserWithPassword } from '@/db/seed/factories';
import { getAuth } from '@/lib/auth/auth';
import { assessmentInputSchema, assessmentSchema, CHECK_IDS, type AssessmentInput } from '@/lib/arbitration';
import { problemDetailsSchema } from '@/lib/openapi/document';
import { POST } from '@/app/api/v1/assessments/route';
import { GET as getOpenApi } from '@/app/api/v1/openapi.json/route';
import { cookieHeaderFrom, expectProblem } from './helpers';

// Faults injected on purpose, off unless a test turns them on: no role lacks the permission today,
// and no body that passes the schema makes the module throw, yet the route must handle both.
const faults = vi.hoisted(() => ({ assessThrows: null as Error | null, denyAssessment: false }));

vi.mock('@/lib/arbitration', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/arbitration')>();
  return {
    ...actual,
    assess: (input: AssessmentInput) => {
      if (faults.assessThrows) throw faults.assessThrows;
      return actual.assess(input);
    },
  };
});

vi.mock('@/lib/auth/permissions', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/auth/permissions')>();
  return {
    ...actual,
    can: ((role, resource, action) =>
      faults.denyAssessment && resource === 'assessment' ? false : actual.can(role, resource, action)) as typeof actual.can,
  };
});

const PASSWORD = 'invented-pass-phrase-4418';
let cookie = '';

beforeAll(async () => {
  const farm = await createOrganisation(getDb(), { name: 'Alderbrook Dairy Partnership', kind: 'supplier' });
  await createUserWithPassword(getDb(), {
    email: 'tamsin.hollow@alderbrook.test',
    name: 'Tamsin Hollow',
    role: 'supplier',
    organisationId: farm.id,
    password: PASSWORD,
  });
  const signedIn = await getAuth().api.signInEmail({
    body: { email: 'tamsin.hollow@alderbrook.test', password: PASSWORD },
    asResponse: true,
  });
  expect(signedIn.status).toBe(200);
  cookie = cookieHeaderFrom(signedIn);
});

afterEach(() => {
  faults.assessThrows = null;
  faults.denyAssessment = false;
  vi.restoreAllMocks();
});

function post(body: string | undefined, options: { cookie?: string; contentType?: string | null } = {}): Promise<Response> {
  const headers = new Headers();
  if (options.cookie) headers.set('cookie', options.cookie);
  const contentType = options.contentType === undefined ? 'application/json' : options.contentType;
  if (contentType !== null) headers.set('content-type', contentType);
  const request = new Request('http://localhost:3000/api/v1/assessments', { method: 'POST', headers, body });
  return POST(request, { params: Promise.resolve({}) });
}

const postJson = (value: unknown) => post(JSON.stringify(value), { cookie });

/**
 * An invented delivery, clearly watered: the intake found −0.5101 °C and the referee laboratory
 * −0.51095 °C on the retained sample, against a −0.515 °C limit under guarded rejection.
 */
function wateredDelivery(chargedPercent: number): AssessmentInput {
  return {
    rules: {
      precision: { r: 0.004, R: 0.006 },
      limits: { upper: -0.515, lower: -0.56 },
      decisionRule: 'guarded_rejection',
      onDisagreement: 'third_laboratory',
      referenceFreezingPoint: -0.52,
      adjustThresholdPercent: 1,
      calibration: { tolerance: 0.004, required: 3 },
      sampleValidHours: 48,
      storageRange: { min: 0, max: 6 },
    },
    original: {
      readings: [-0.5098, -0.5104],
      testedAt: '2025-09-08T06:35:00+02:00',
      calibration: { nominal: -0.512, readings: [-0.5118, -0.5123, -0.5121, -0.5116, -0.5125] },
    },
    retest: {
      readings: [-0.5107, -0.5112],
      testedAt: '2025-09-09T11:40:00+02:00',
      calibration: { nominal: -0.512, readings: [-0.5122, -0.5119, -0.5124, -0.5117, -0.512] },
      sample: {
        sampledAt: '2025-09-08T06:10:00+02:00',
        sealIntact: true,
        frozen: false,
        custodyComplete: true,
        storageTemperatures: [3.9, 4.3, 4.0, 4.6, 3.8],
      },
    },
    intake: { addedWaterPercent: chargedPercent },
  };
}

describe('POST /api/v1/assessments', () => {
  it('answers 401 problem details without a session', async () => {
    for (const withCookie of [undefined, 'better-auth.session_token=not-a-session']) {
      const response = await post(JSON.stringify(wateredDelivery(1.5)), { cookie: withCookie });
      const problem = await expectProblem(response, 401);
      expect(problem.code).toBe('unauthenticated');
      expect(response.headers.get('www-authenticate')).toContain('Cookie');
    }
  });

  it('proposes to uphold a clearly watered delivery whose charge was about right', async () => {
    const response = await postJson(wateredDelivery(1.5));
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toMatch(/^application\/json/);
    expect(response.headers.get('cache-control')).toBe('no-store');
    const body = await response.json();
    const assessment = assessmentSchema.parse(body);
    expect(assessment.outcome).toBe('uphold');
    // ISO 5725-6 critical difference for means of 2 and 2: √(6² − 4²·(1 − ¼ − ¼)) = √28 = 5.292 m°C.
    expect(assessment.comparison?.criticalDifference).toBeCloseTo(0.0052915, 7);
    expect(assessment.comparison?.agree).toBe(true);
    expect(assessment.acceptedValue).toBeCloseTo(-0.510525, 9);
    expect(assessment.n).toEqual([2, 2]);
    // Guard band 1.645·u with u = √(2·(σR² − σr² + σr²/2))/2 = 1.336 m°C (domain.md, the product's guard band).
    expect(assessment.conformity?.upper.acceptanceLimit).toBeCloseTo(-0.512802, 6);
    expect(assessment.conformity?.upper.beyond).toBe(true);
    expect(assessment.conformity?.lower?.beyond).toBe(false);
    // (−0.520 − −0.510525) / −0.520 × 100 = 1.822 %, within 1 % of the 1.5 % charged.
    expect(assessment.addedWater?.percent).toBeCloseTo(1.8221, 4);
    expect(assessment.checks.map((c) => c.id).sort()).toEqual([...CHECK_IDS].sort());
    expect(assessment.summary).toContain('The arbiter decides.');
  });

  it('proposes to adjust when the charge is more than the threshold off', async () => {
    const response = await postJson(wateredDelivery(3.2));
    expect(response.status).toBe(200);
    const assessment = assessmentSchema.parse(await response.json());
    expect(assessment.outcome).toBe('adjust');
    expect(assessment.checks.find((c) => c.id === 'intake.added_water')?.status).toBe('fail');
  });

  it('answers 415 for a body that is not declared as JSON', async () => {
    for (const contentType of ['text/plain', 'application/x-www-form-urlencoded', null]) {
      const problem = await expectProblem(await post(JSON.stringify(wateredDelivery(1.5)), { cookie, contentType }), 415);
      expect(problem.code).toBe('unsupported_media_type');
    }
  });

  it('answers 400 for a body that is not JSON', async () => {
    for (const text of ['{"rules": ', 'rules=1', '']) {
      const problem = await expectProblem(await post(text, { cookie }), 400);
      expect(problem.code).toBe('invalid');
      expect(problem.errors).toBeUndefined();
    }
  });

  it('answers 413 for a body over 256 KiB', async () => {
    const problem = await expectProblem(await post(JSON.stringify({ padding: 'x'.repeat(300 * 1024) }), { cookie }), 413);
    expect(problem.code).toBe('payload_too_large');
  });

  it('names each bad field by its path', async () => {
    const body = wateredDelivery(1.5) as unknown as Record<string, any>;
    body.rules.precision.r = 'four';
    body.rules.decisionRule = 'lenient';
    body.rules.limits = { uper: -0.515, lower: -0.56 };
    body.original.readings[0] = -0.51235;
    delete body.retest.sample.sealIntact;
    const problem = await expectProblem(await postJson(body), 400);
    expect(problem.code).toBe('invalid');
    expect(Object.keys(problem.errors ?? {}).sort()).toEqual(
      [
        'original.readings.0',
        'retest.sample.sealIntact',
        'rules.decisionRule',
        'rules.limits',
        'rules.limits.upper',
        'rules.precision.r',
      ].sort(),
    );
    expect(problem.errors?.['rules.precision.r']).toEqual(['must be a number in °C']);
    expect(problem.errors?.['original.readings.0']?.[0]).toContain('4 decimals');
    expect(problem.errors?.['rules.limits']?.[0]).toContain('uper');
  });

  it('names the missing parts of an empty object and the body itself when it is not an object', async () => {
    const empty = await expectProblem(await postJson({}), 400);
    expect(Object.keys(empty.errors ?? {}).sort()).toEqual(['original', 'rules']);
    for (const value of [null, [], 42, 'assess this']) {
      const problem = await expectProblem(await postJson(value), 400);
      expect(Object.keys(problem.errors ?? {})).toEqual(['_']);
    }
  });

  it('answers 403 to a role without the permission, before reading the body', async () => {
    faults.denyAssessment = true;
    for (const text of [JSON.stringify(wateredDelivery(1.5)), 'not json']) {
      const problem = await expectProblem(await post(text, { cookie }), 403);
      expect(problem.code).toBe('forbidden');
    }
  });

  it('turns a RangeError of the module into 400, and only a RangeError', async () => {
    faults.assessThrows = new RangeError('n[0] must be a whole number of readings, at least 1, got 0');
    const problem = await expectProblem(await postJson(wateredDelivery(1.5)), 400);
    expect(problem.code).toBe('invalid');
    expect(problem.detail).toContain('n[0] must be a whole number');

    // Any other failure is a bug: logged, and answered as an internal error without detail.
    vi.spyOn(console, 'error').mockImplementation(() => {});
    faults.assessThrows = new Error('assess: no outcome was reached');
    const internal = await expectProblem(await postJson(wateredDelivery(1.5)), 500);
    expect(internal.detail).not.toContain('no outcome');
  });

  it('answers every random body with 200 or a 4xx problem, never a 5xx', async () => {
    type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
    const valid = wateredDelivery(1.5) as unknown as Json;

    const paths: (string | number)[][] = [];
    const walk = (value: Json, path: (string | number)[]) => {
      paths.push(path);
      if (Array.isArray(value)) value.forEach((item, i) => walk(item, [...path, i]));
      else if (value !== null && typeof value === 'object') for (const [key, item] of Object.entries(value)) walk(item, [...path, key]);
    };
    walk(valid, []);
    const leafPaths = (kind: string) => paths.filter((path) => path.length > 0 && typeof get(valid, path) === kind);
    function get(value: Json, path: (string | number)[]): Json | undefined {
      let at: Json | undefined = value;
      for (const key of path) at = at !== null && typeof at === 'object' ? (at as Record<string, Json>)[key] : undefined;
      return at;
    }
    function apply(edits: { path: (string | number)[]; value: Json | undefined }[]): Json {
      let body = structuredClone(valid);
      for (const { path, value } of edits) {
        if (path.length === 0) {
          body = value ?? null;
          continue;
        }
        const parent = get(body, path.slice(0, -1));
        if (parent === null || typeof parent !== 'object') continue;
        const key = path[path.length - 1];
        if (value === undefined) delete (parent as Record<string | number, Json>)[key];
        else (parent as Record<string | number, Json>)[key] = value;
      }
      return body;
    }

    const anyEdit = fc.record({ path: fc.constantFrom(...paths), value: fc.option(fc.jsonValue() as fc.Arbitrary<Json>, { nil: undefined }) });
    // Plausible edits keep most bodies valid, so the module itself meets odd but legal input.
    const nudge = (path: (string | number)[]) => {
      const original = get(valid, path);
      if (typeof original === 'number') {
        return fc.integer({ min: -120, max: 120 }).map((step) => Math.round((original + step / 10_000) * 10_000) / 10_000);
      }
      if (typeof original === 'boolean') return fc.boolean();
      if (typeof original === 'string' && !String(path[path.length - 1]).endsWith('At')) {
        return fc.constantFrom('simple', 'guarded_rejection', 'guarded_acceptance', 'third_laboratory', 'referee_decides');
      }
      if (typeof original === 'string') {
        return fc.integer({ min: -72, max: 96 }).map((hours) => new Date(Date.parse(original) + hours * 3_600_000).toISOString());
      }
      return fc.array(fc.integer({ min: -5300, max: -5000 }).map((tenths) => tenths / 10_000), { maxLength: 6 });
    };
    const plausibleEdit = fc
      .constantFrom(...paths.filter((path) => path.length > 0 && !(typeof path[path.length - 1] === 'number')))
      .chain((path) => {
        const original = get(valid, path);
        const replaceable = original === null || typeof original !== 'object' || Array.isArray(original);
        const value: fc.Arbitrary<Json | undefined> = replaceable ? nudge(path) : fc.constant(undefined);
        return value.map((v) => ({ path, value: v }));
      });
    const bodies = fc.oneof(
      fc.jsonValue() as fc.Arbitrary<Json>,
      fc.array(anyEdit, { minLength: 1, maxLength: 4 }).map(apply),
      { arbitrary: fc.array(plausibleEdit, { minLength: 1, maxLength: 4 }).map(apply), weight: 2 },
    );

    const tally = { runs: 0, ok: 0, problems: 0 };
    await fc.assert(
      fc.asyncProperty(bodies, async (body) => {
        tally.runs++;
        const response = await postJson(body);
        const payload = await response.json();
        if (response.status === 200) {
          tally.ok++;
          expect(response.headers.get('content-type')).toMatch(/^application\/json/);
          expect(assessmentSchema.safeParse(payload).success).toBe(true);
          return;
        }
        tally.problems++;
        expect(response.status).toBeGreaterThanOrEqual(400);
        expect(response.status).toBeLessThan(500);
        expect(response.headers.get('content-type')).toMatch(/^application\/problem\+json/);
        expect(problemDetailsSchema.safeParse(payload).success).toBe(true);
        expect(payload.status).toBe(response.status);
      }),
      { numRuns: 400 },
    );
    expect(tally.runs).toBeGreaterThanOrEqual(300);
    // Both kinds of answer occur, so the property does not hold only because nothing got past the schema.
    expect(tally.ok).toBeGreaterThan(20);
    expect(tally.problems).toBeGreaterThan(20);
  });
});

describe('GET /api/v1/openapi.json', () => {
  async function fetchDocument() {
    const response = await getOpenApi(new Request('http://localhost:3000/api/v1/openapi.json'), { params: Promise.resolve({}) });
    return { response, document: (await response.json()) as Record<string, any> };
  }

  it('serves an OpenAPI 3.1 document without a session', async () => {
    const { response, document } = await fetchDocument();
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toMatch(/^application\/json/);
    expect(document.openapi).toMatch(/^3\.1\./);
    expect(document.paths['/api/v1/cases']?.get).toBeDefined();
    expect(document.paths['/api/v1/cases/{caseId}']?.get).toBeDefined();
    expect(document.paths['/api/v1/assessments']?.post).toBeDefined();
    expect(document.components.securitySchemes.sessionCookie).toMatchObject({ type: 'apiKey', in: 'cookie', name: 'better-auth.session_token' });
    expect(document.paths['/api/v1/openapi.json'].get.security).toEqual([]);
  });

  it('documents every method of every route under /api/v1', async () => {
    const fs = await import('node:fs');
    const path = await import('node:path');
    const { document } = await fetchDocument();
    const root = path.join(process.cwd(), 'app', 'api', 'v1');
    const routes = (fs.readdirSync(root, { recursive: true }) as string[]).filter((f) => path.basename(f) === 'route.ts');
    expect(routes.length).toBeGreaterThan(5);
    for (const file of routes) {
      const route = `/api/v1/${path.dirname(file).split(path.sep).join('/')}`.replace(/\[(\w+)\]/g, '{$1}');
      const source = fs.readFileSync(path.join(root, file), 'utf8');
      const methods = [...source.matchAll(/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g)].map((m) => m[1].toLowerCase());
      expect(methods.length, file).toBeGreaterThan(0);
      // A segment like {transition} may be documented once per value it takes (/transitions/dispatch, …).
      const pattern = new RegExp(`^${route.replace(/\{(\w+)\}/g, (_m, name) => `(\\{${name}\\}|[a-z_]+)`)}$`);
      const documented = Object.keys(document.paths).filter((p) => pattern.test(p));
      for (const method of methods) expect(documented.some((p) => document.paths[p][method]), `${method.toUpperCase()} ${route}`).toBe(true);
    }
  });

  it('resolves every $ref inside the document', async () => {
    const { document } = await fetchDocument();
    const refs: string[] = [];
    const collect = (value: unknown) => {
      if (Array.isArray(value)) value.forEach(collect);
      else if (value !== null && typeof value === 'object') {
        for (const [key, item] of Object.entries(value)) {
          if (key === '$ref') refs.push(item as string);
          else collect(item);
        }
      }
    };
    collect(document);
    expect(refs.length).toBeGreaterThan(10);
    for (const ref of new Set(refs)) {
      expect(ref.startsWith('#/'), ref).toBe(true);
      let target: unknown = document;
      for (const part of ref.slice(2).split('/')) {
        const key = part.replaceAll('~1', '/').replaceAll('~0', '~');
        target = target !== null && typeof target === 'object' ? (target as Record<string, unknown>)[key] : undefined;
      }
      expect(target, `${ref} does not resolve`).toBeTypeOf('object');
    }
  });

  it('documents the assessment body and answers from the same schemas the route uses', async () => {
    const { document } = await fetchDocument();
    const operation = document.paths['/api/v1/assessments'].post;
    const media = operation.requestBody.content['application/json'];
    expect(media.schema).toEqual({ $ref: '#/components/schemas/AssessmentInput' });
    expect(operation.responses['200'].content['application/json'].schema).toEqual({ $ref: '#/components/schemas/Assessment' });
    expect(operation.responses['400'].content['application/problem+json'].schema).toEqual({ $ref: '#/components/schemas/ProblemDetails' });
    const input = document.components.schemas.AssessmentInput;
    expect(input.required).toEqual(['rules', 'original']);
    expect(input.properties.rules.properties.precision.required).toEqual(['r', 'R']);
    expect(document.components.schemas.ProblemDetails.properties.errors.additionalProperties).toEqual({ type: 'array', items: { type: 'string' } });

    // The documented example is a body the route accepts.
    expect(assessmentInputSchema.safeParse(media.example).success).toBe(true);
    expect((await postJson(media.example)).status).toBe(200);

    const cases = document.paths['/api/v1/cases'].get;
    expect(cases.parameters.map((p: { name: string }) => p.name)).toEqual(
      expect.arrayContaining(['page', 'pageSize', 'status', 'supplier', 'lab', 'overdue', 'q', 'sort', 'order']),
    );
    expect(document.components.schemas.CaseListPage.required).toEqual(['items', 'total', 'page', 'pageSize']);
  });
});
