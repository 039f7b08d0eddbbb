import { z } from 'zod';
import { getDb } from '@/db/client';
import { withActor, parseParams } from '@/lib/http/api';
import { getCaseFile } from '@/lib/dal/case-file';

export const dynamic = 'force-dynamic';

const paramsSchema = z.object({ caseId: z.uuid() });

/** One case file as the caller may see it; someone else's case answers 404 like a missing one. */
export const GET = withActor<{ caseId: string }>(async ({ actor, params }) => {
  const { caseId } = parseParams(params, paramsSchema, 'That case');
  return getCaseFile(getDb(), actor, caseId);
});
