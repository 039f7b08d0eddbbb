import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requireActor } from '@/lib/auth/session';
import { roleLabels } from '@/lib/auth/permissions';
import { listOwnSessions } from '@/lib/dal/sessions';
import { Card, DefinitionList, PageHeader } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { EndOtherSessionsButton, EndSessionButton } from '@/components/shell/session-buttons';
import { formatDateTime } from '@/lib/format/dates';
import { endOtherSessionsAction, endSessionAction } from './actions';

export const metadata: Metadata = { title: 'Your account' };

export default async function AccountPage() {
  const actor = await requireActor();
  const sessions = await listOwnSessions(getDb(), actor);
  return (
    <>
      <PageHeader title="Your account" eyebrow={actor.organisationName} />
      <div className="grid gap-6 md:grid-cols-[1fr_2fr]">
        <Card title="You">
          <DefinitionList
            items={[
              { term: 'Name', detail: actor.name },
              { term: 'E-mail', detail: actor.email },
              { term: 'Role', detail: roleLabels[actor.role] },
              { term: 'Organisation', detail: actor.organisationName },
            ]}
          />
          <p className="mt-4 text-sm">
            To change your password, <a href="/forgot-password">ask for a reset link</a>; it signs you out everywhere.
          </p>
        </Card>
        <Card title="Where you are signed in" actions={<EndOtherSessionsButton action={endOtherSessionsAction} />}>
          <ul className="grid gap-3">
            {sessions.map((s) => (
              <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 rounded-card border border-line bg-white p-3 text-sm">
                <div>
                  <p className="font-bold">
                    {s.userAgent ? s.userAgent.slice(0, 80) : 'Unknown browser'} {s.current ? <Badge tone="action">This session</Badge> : null}
                  </p>
                  <p className="text-xs text-brine">
                    Signed in {formatDateTime(s.createdAt)} · last active {formatDateTime(s.updatedAt)} · expires {formatDateTime(s.expiresAt)}
                    {s.ipAddress ? ` · from ${s.ipAddress}` : ''}
                  </p>
                </div>
                {s.current ? null : <EndSessionButton sessionId={s.id} action={endSessionAction} />}
              </li>
            ))}
          </ul>
        </Card>
      </div>
    </>
  );
}
