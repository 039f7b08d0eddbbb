import { withActor } from '@/lib/http/api';
import { redirectToStoredFile } from '@/lib/evidence/download';

export const dynamic = 'force-dynamic';

/** The preview of an image, under the same checks as the file itself. */
export const GET = withActor<{ caseId: string; attachmentId: string }>(async ({ actor, params }) => redirectToStoredFile(actor, params, 'thumbnail'));
