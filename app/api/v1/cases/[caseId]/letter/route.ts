import { z } from 'zod';
import { getDb } from '@/db/client';
import { withActor, parseParams, parseSearchParams } from '@/lib/http/api';
import { requestOrigin } from '@/lib/http/origin';
import { letterForParty } from '@/lib/dal/decision-delivery';

export const dynamic = 'force-dynamic';

const paramsSchema = z.object({ caseId: z.uuid() });
const querySchema = z.object({ decision: z.uuid('must be the id of a decision of this case').optional() });

/**
 * The decision letter as a PDF, for the parties of the case only: anyone else gets 404, exactly as
 * for a case that does not exist. Without `decision`, the current decision's letter.
 */
export const GET = withActor<{ caseId: string }>(async ({ request, actor, params }) => {
  const { caseId } = parseParams(params, paramsSchema, 'That case');
  const { decision } = parseSearchParams(request, querySchema);
  const letter = await letterForParty(getDb(), actor, caseId, decision, requestOrigin(request.headers, 'api'));
  return new Response(new Uint8Array(letter.pdf), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `attachment; filename="${letter.fileName}"`,
      'content-length': String(letter.pdf.length),
      'cache-control': 'private, no-store',
      'x-content-type-options': 'nosniff',
    },
  });
});
