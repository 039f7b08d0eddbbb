import { z } from 'zod';
import { getDb } from '@/db/client';
import { withActor, parseParams, readJsonBody } from '@/lib/http/api';
import { requestOrigin } from '@/lib/http/origin';
import { isTransitionName } from '@/lib/cases/lifecycle';
import { runTransition } from '@/lib/dal/case-transition';
import { AppError } from '@/lib/errors';
import { caseStatuses, type CaseStatus } from '@/db/schema/cases';

export const dynamic = 'force-dynamic';

const paramsSchema = z.object({ caseId: z.uuid(), transition: z.string().refine(isTransitionName) });

/** One lifecycle transition of a case: dispatch, receive, submit_retest, order_further_test or withdraw. */
export const POST = withActor<{ caseId: string; transition: string }>(async ({ request, actor, params }) => {
  const { caseId, transition } = parseParams(params, paramsSchema, 'That case or transition');
  if (!isTransitionName(transition)) throw new AppError('not_found', 'That transition does not exist.');
  const body = await readJsonBody(request);
  // Optional optimistic concurrency: If-Match names the status the client last saw.
  const seen = request.headers.get('if-match')?.replace(/^(W\/)?"|"$/g, '');
  const expectedStatus = seen && (caseStatuses as readonly string[]).includes(seen) ? (seen as CaseStatus) : undefined;
  if (seen && !expectedStatus) throw new AppError('invalid', `If-Match must name a case status: ${caseStatuses.join(', ')}.`);
  return runTransition(getDb(), actor, caseId, transition, body, { origin: requestOrigin(request.headers, 'api'), expectedStatus });
});
