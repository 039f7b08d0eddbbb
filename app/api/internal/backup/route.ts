import { withoutActor } from '@/lib/http/api';
import { serveBackupSnapshot } from '@/lib/backup/serve';

export const dynamic = 'force-dynamic';

/** For `npm run db:backup` on this machine only: loopback and the start-up token, no session. */
export const POST = withoutActor(async ({ request }) => serveBackupSnapshot(request));
