import 'server-only';
import { eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { pipelined } from '@/db/pipeline';
import { delivery, intakeResult } from '@/db/schema';
import type { Assessment, AssessmentInput } from '@/lib/arbitration';
import type { BindingOutcome } from '@/lib/decision/labels';
import { settlementFor, SettlementError, type Settlement } from '@/lib/decision/settlement';
import { bindingOutcomes } from '@/lib/decision/labels';
import { AppError } from '@/lib/errors';
import { proposalFor } from './case-assessment';
import { rulesVersion } from './rules';
import type { CaseRow } from './transitions/context';

export type DecisionProposal = { input: AssessmentInput; assessment: Assessment };

/**
 * What a decision on a case would rest on now: the proposal, and the settlement each outcome would bring.
 * A proposal the caller has already worked out for this case row (`known`) is not computed again.
 */
export async function decisionBasis(db: DbOrTx, caseRow: CaseRow, known?: Awaited<ReturnType<typeof proposalFor>>) {
  // Pipelined, not Promise.all: signing asks for this inside its transaction, where a PostgreSQL client takes one statement at a time.
  const [rules, proposal, [load], [result]] = await pipelined([
    () => rulesVersion(db, caseRow.rulesVersionId),
    () => (known ? Promise.resolve(known) : proposalFor(db, caseRow)),
    () => db.select({ volumeLitres: delivery.volumeLitres }).from(delivery).where(eq(delivery.id, caseRow.deliveryId)),
    () => db.select().from(intakeResult).where(eq(intakeResult.id, caseRow.intakeResultId)),
  ]);
  if (!rules || !proposal || !load || !result) throw new Error(`Case ${caseRow.number} is missing its rules, proposal, delivery or intake result`);
  const { money, currency } = rules.rules;
  const water = proposal.assessment.addedWater;
  const settle = (outcome: BindingOutcome): Settlement =>
    settlementFor({
      outcome,
      currency,
      volumeLitres: load.volumeLitres,
      pricePerLitre: money.milkPricePerLitre,
      intake: { verdict: result.verdict, amountMinor: result.amountMinor, addedWaterBasisPoints: result.addedWaterBasisPoints },
      acceptedAddedWaterPercent: water === null ? null : water.percent,
      refereeFee: money.refereeFee,
      feeBorneBy: money.feeBorneBy,
    });
  const settlements = {} as Record<BindingOutcome, { settlement: Settlement } | { unavailable: string }>;
  for (const outcome of bindingOutcomes) {
    try {
      settlements[outcome] = { settlement: settle(outcome) };
    } catch (error) {
      if (!(error instanceof SettlementError)) throw error;
      settlements[outcome] = { unavailable: error.message };
    }
  }
  return { proposal: proposal as DecisionProposal, settlements, currency };
}

/** The settlement of the chosen outcome, or a field error saying why it cannot be had. */
export function settlementOrRefusal(basis: Awaited<ReturnType<typeof decisionBasis>>, outcome: BindingOutcome): Settlement {
  const choice = basis.settlements[outcome];
  if ('unavailable' in choice) throw new AppError('invalid', choice.unavailable, { fieldErrors: { outcome: [choice.unavailable] } });
  return choice.settlement;
}
