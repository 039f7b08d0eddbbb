import { withActor } from '@/lib/http/api';
import { redirectToStoredFile } from '@/lib/evidence/download';

export const dynamic = 'force-dynamic';

/**
 * One file of evidence, for the people on the case: a 303 to a short-lived signed link. Anyone else,
 * and a blind laboratory asking for another party's file, gets 404 as for a file that does not exist.
 */
export const GET = withActor<{ caseId: string; attachmentId: string }>(async ({ actor, params }) => redirectToStoredFile(actor, params, 'original'));
