import 'server-only';
import { and, asc, eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { instrument, organisation } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { availableTransitions } from '@/lib/cases/lifecycle';
import { proposalFor } from './case-assessment';
import { currentSample } from './case-samples';
import { findVisibleCase } from './cases';
import { holdsRoleOn, isBlindFor } from './case-scope';
import { rulesVersion } from './rules';

/**
 * What the case file offers this actor to do now, and what each form needs: the transitions its role
 * may make from the current state, the laboratories, its instruments, the rules, and the proposal.
 */
export async function caseWorkbench(db: DbOrTx, actor: Actor, caseId: string) {
  const row = await findVisibleCase(db, actor, caseId);
  const allowed = holdsRoleOn(actor, row) ? availableTransitions(row.status, (permission) => can(actor.role, 'case', permission)) : [];
  const blind = isBlindFor(actor, row.retestSubmittedAt);
  const [rules, sample, laboratories, instruments] = await Promise.all([
    rulesVersion(db, row.rulesVersionId),
    currentSample(db, row),
    db.select({ id: organisation.id, name: organisation.name }).from(organisation).where(eq(organisation.kind, 'lab')).orderBy(asc(organisation.name)),
    actor.role === 'lab'
      ? db.select({ id: instrument.id, serial: instrument.serialNumber, description: instrument.description }).from(instrument).where(and(eq(instrument.organisationId, actor.organisationId), eq(instrument.active, true)))
      : Promise.resolve([]),
  ]);
  // Nothing of the intake may reach a laboratory that has not submitted yet, not even through the chart.
  const proposal = blind ? null : await proposalFor(db, row);
  return {
    allowed,
    rules: rules?.rules ?? null,
    sample: sample ? { code: sample.code, sealNumber: sample.sealNumber } : null,
    laboratories,
    instruments: instruments.map((i) => ({ id: i.id, label: `${i.serial} · ${i.description}` })),
    proposal,
    showProposal: can(actor.role, 'case', 'review') && (row.status === 'review' || row.status === 'decided'),
    hasRetest: row.retestSubmittedAt !== null,
  };
}
