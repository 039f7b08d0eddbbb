import { getDb } from '@/db/client';
import { withActor, parseSearchParams } from '@/lib/http/api';
import { listCases } from '@/lib/dal/cases';
import { caseListQuerySchema } from '@/lib/dal/cases-query';

export const dynamic = 'force-dynamic';

/** The paged list of cases the caller may see. */
export const GET = withActor(async ({ request, actor }) => {
  const query = parseSearchParams(request, caseListQuerySchema);
  return listCases(getDb(), actor, query);
});
