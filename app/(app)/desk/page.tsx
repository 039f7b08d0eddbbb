import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db/client';
import { requireActor } from '@/lib/auth/session';
import { roleLabels } from '@/lib/auth/permissions';
import { listCases } from '@/lib/dal/cases';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import { listDeliveries, deliveryListQuerySchema } from '@/lib/dal/deliveries';
import { adminCounts } from '@/lib/dal/admin';
import { rulesInForce } from '@/lib/dal/rules';
import { Card, DefinitionList, PageHeader } from '@/components/ui/card';
import { CaseTable } from '@/components/cases/case-table';
import { DeliveryTable } from '@/components/deliveries/delivery-table';
import { ButtonLink } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format/dates';
import { listInstruments } from '@/lib/dal/instruments';
import { InstrumentStatusList } from '@/components/instruments/instrument-status';

export const metadata: Metadata = { title: 'Desk' };

const casesQuery = (status: string, pageSize = 10) => caseListQuerySchema.parse({ status, pageSize, sort: 'dueAt', order: 'asc' });

export default async function DeskPage() {
  const actor = await requireActor();
  const db = getDb();
  const header = <PageHeader eyebrow={`${roleLabels[actor.role]} · ${actor.organisationName}`} title={`Desk of ${actor.name}`} />;

  if (actor.role === 'supplier') {
    const [contestable, cases] = await Promise.all([
      listDeliveries(db, actor, deliveryListQuerySchema.parse({ verdict: 'rejected,deducted', sinceDays: 14, pageSize: 10 })),
      listCases(db, actor, casesQuery('open,awaiting_sample,retest,review')),
    ]);
    return (
      <>
        {header}
        <div className="grid gap-6">
          <Card id="rejections" title="Rejected and deducted deliveries, last 14 days" actions={<ButtonLink href="/deliveries" variant="secondary">All deliveries</ButtonLink>}>
            <DeliveryTable items={contestable.items} showContest empty={{ title: 'No rejections or deductions in the last 14 days.', detail: 'Every load of your farms was accepted.' }} />
          </Card>
          <Card id="disputes" title="Your disputes in progress" actions={<ButtonLink href="/cases" variant="secondary">All cases</ButtonLink>}>
            <CaseTable items={cases.items} empty={{ title: 'No dispute in progress.', detail: 'A dispute can be opened against a rejection or deduction while its contest window is open.' }} />
          </Card>
        </div>
      </>
    );
  }

  if (actor.role === 'plant') {
    const [rejections, cases, instruments] = await Promise.all([
      listDeliveries(db, actor, deliveryListQuerySchema.parse({ verdict: 'rejected,deducted', sinceDays: 7, pageSize: 10 })),
      listCases(db, actor, casesQuery('open,awaiting_sample,retest,review')),
      listInstruments(db, actor, { activeOnly: true, organisationId: actor.organisationId }),
    ]);
    return (
      <>
        {header}
        <div className="grid gap-6">
          <Card id="intake" title="Intake" actions={<ButtonLink href="/intake">Record an intake</ButtonLink>}>
            <InstrumentStatusList instruments={instruments} />
          </Card>
          <Card id="cases" title="Open cases" actions={<ButtonLink href="/cases" variant="secondary">All cases</ButtonLink>}>
            <CaseTable items={cases.items} empty={{ title: 'No open case.', detail: 'No supplier contests an intake result at the moment.' }} />
          </Card>
          <Card id="rejections" title="Rejections and deductions, last 7 days" actions={<ButtonLink href="/deliveries" variant="secondary">All deliveries</ButtonLink>}>
            <DeliveryTable items={rejections.items} showContest={false} empty={{ title: 'No rejection or deduction in the last 7 days.' }} />
          </Card>
        </div>
      </>
    );
  }

  if (actor.role === 'lab') {
    const cases = await listCases(db, actor, casesQuery('awaiting_sample,retest'));
    return (
      <>
        {header}
        <Card id="retests" title="Retests assigned to your laboratory">
          <p className="mb-3 text-sm text-brine">The retest is blind: the intake readings and value stay hidden until your readings are submitted.</p>
          <CaseTable items={cases.items} empty={{ title: 'No sample is on its way or waiting at your bench.' }} />
        </Card>
      </>
    );
  }

  if (actor.role === 'arbiter') {
    const [review, active] = await Promise.all([listCases(db, actor, casesQuery('review')), listCases(db, actor, casesQuery('open,awaiting_sample,retest'))]);
    return (
      <>
        {header}
        <div className="grid gap-6">
          <Card id="review" title="Cases to decide">
            <CaseTable items={review.items} empty={{ title: 'No case is waiting for the board.' }} />
          </Card>
          <Card id="pipeline" title="Cases on their way to the board">
            <CaseTable items={active.items} empty={{ title: 'No other case is in progress.' }} />
          </Card>
        </div>
      </>
    );
  }

  const [counts, rules] = await Promise.all([adminCounts(db, actor), rulesInForce(db)]);
  return (
    <>
      {header}
      <div className="grid gap-6 md:grid-cols-2">
        <Card id="scheme" title="The scheme">
          <DefinitionList
            items={[
              { term: 'Organisations', detail: <Link href="/admin/organisations">{counts.organisations}</Link> },
              { term: 'People', detail: <Link href="/admin/users">{counts.people}</Link> },
              { term: 'Open invitations', detail: counts.openInvitations },
              { term: 'Active sessions', detail: counts.activeSessions },
            ]}
          />
        </Card>
        <Card id="rules" title="Rules in force" actions={<ButtonLink href="/admin/rules" variant="secondary">Rules</ButtonLink>}>
          {rules ? (
            <DefinitionList
              items={[
                { term: 'Scheme', detail: rules.rules.name },
                { term: 'Version', detail: `v${rules.version}, in force since ${formatDateTime(rules.effectiveFrom)}` },
              ]}
            />
          ) : (
            <p className="text-sm text-rust">No rules are in force yet. Intake results and disputes need them.</p>
          )}
        </Card>
        <Card id="duties" title="Your duties">
          <p className="text-sm text-ink-soft">
            As administrator you manage organisations, people, instruments and the scheme’s rules. You do not read or decide cases: that
            separation keeps every decision with the parties and the board.
          </p>
        </Card>
      </div>
    </>
  );
}
