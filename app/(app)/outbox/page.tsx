import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { desc } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { outgoingMail } from '@/db/schema';
import { requirePermission } from '@/lib/auth/session';
import { outboxEnabled } from '@/lib/env';
import { fetchCaughtMail } from '@/lib/mail/catcher-client';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { FormMessage } from '@/components/ui/field';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Outbox' };

export default async function OutboxPage() {
  await requirePermission('outbox', 'read');
  // The caught mail holds invitation and reset links: never shown in production.
  if (!outboxEnabled()) notFound();
  const [caught, sent] = await Promise.all([
    fetchCaughtMail(),
    getDb().select({ id: outgoingMail.id, to: outgoingMail.to, subject: outgoingMail.subject, status: outgoingMail.status, attempts: outgoingMail.attempts, lastError: outgoingMail.lastError, createdAt: outgoingMail.createdAt }).from(outgoingMail).orderBy(desc(outgoingMail.createdAt)).limit(50),
  ]);
  return (
    <>
      <PageHeader title="Outbox" eyebrow="Demo and development only" />
      <div className="grid gap-6">
        <Card title="Caught by the local mail catcher">
          {caught === null ? (
            <FormMessage tone="error">The local mail catcher is not answering. Start it with npm run mail:catcher (npm run demo starts it for you).</FormMessage>
          ) : caught.length === 0 ? (
            <EmptyState title="No mail caught yet">Invitations, password resets and case notices appear here.</EmptyState>
          ) : (
            <ul className="grid gap-3">
              {caught.map((m) => (
                <li key={m.id} className="rounded-card border border-line bg-white p-3">
                  <details>
                    <summary className="cursor-pointer">
                      <span className="font-bold">{m.subject}</span>
                      <span className="block text-xs text-brine">
                        to {m.to.join(', ')} · {formatDateTime(m.receivedAt)}
                        {m.attachments.length ? ` · ${m.attachments.length} attachment(s)` : ''}
                      </span>
                    </summary>
                    {/* An empty sandbox: the message's HTML can neither run scripts nor reach this page. */}
                    <iframe title={`Message: ${m.subject}`} sandbox="" srcDoc={m.html || `<pre>${m.text.replace(/[<&]/g, (c) => (c === '<' ? '&lt;' : '&amp;'))}</pre>`} className="mt-3 h-96 w-full rounded border border-line bg-white" />
                  </details>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card title="Sent by the product (last 50)">
          {sent.length === 0 ? (
            <EmptyState title="Nothing sent yet" />
          ) : (
            <table className="w-full text-sm">
              <thead>
                <tr className="border-b border-line text-left text-brine">
                  <th scope="col" className="py-2 pr-3">Subject</th>
                  <th scope="col" className="py-2 pr-3">To</th>
                  <th scope="col" className="py-2 pr-3">Status</th>
                  <th scope="col" className="py-2">Queued</th>
                </tr>
              </thead>
              <tbody>
                {sent.map((m) => (
                  <tr key={m.id} className="border-b border-line/60">
                    <td className="py-2 pr-3">{m.subject}</td>
                    <td className="py-2 pr-3">{m.to.join(', ')}</td>
                    <td className="py-2 pr-3">
                      <Badge tone={m.status === 'sent' ? 'success' : m.status === 'failed' ? 'failure' : 'neutral'}>{m.status}</Badge>
                      {m.lastError ? <span className="block text-xs text-rust">{m.lastError}</span> : null}
                    </td>
                    <td className="py-2 num">{formatDateTime(m.createdAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>
      </div>
    </>
  );
}
