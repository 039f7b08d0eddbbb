import { getDb } from '@/db/client';
import { withActor, parseSearchParams, readJsonBody } from '@/lib/http/api';
import { requestOrigin } from '@/lib/http/origin';
import { listCases } from '@/lib/dal/cases';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import { openDispute } from '@/lib/dal/open-dispute';
import { jsonResponse } from '@/lib/http/json-response';

export const dynamic = 'force-dynamic';

/** The paged list of cases the caller may see. */
export const GET = withActor(async ({ request, actor }) => {
  const query = parseSearchParams(request, caseListQuerySchema);
  return listCases(getDb(), actor, query);
});

/** A supplier opens a dispute against one of its intake results. */
export const POST = withActor(async ({ request, actor }) => {
  const body = await readJsonBody(request);
  const created = await openDispute(getDb(), actor, body, { origin: requestOrigin(request.headers, 'api') });
  return jsonResponse({ id: created.id, number: created.number, status: created.status }, { status: 201, headers: { location: `/api/v1/cases/${created.id}` } });
});
