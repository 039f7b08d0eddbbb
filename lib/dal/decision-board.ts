import 'server-only';
import { and, asc, eq, gte, inArray, isNull, sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { decision, delivery, disputeCase, instrument, intakeResult, measurementSet, organisation } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';
import { fromTenthMilliC } from '@/lib/temperature';
import { rulesInForce } from './rules';

const DAY = 86_400_000;

export type OutcomeCounts = { uphold: number; reverse: number; adjust: number };
export type BoardOverview = {
  boardName: string;
  decided: number;
  byMonth: ({ month: string } & OutcomeCounts)[];
  byLaboratory: ({ laboratory: string } & OutcomeCounts)[];
  byInstrument: { instrument: string; months: ({ month: string } & OutcomeCounts)[]; total: OutcomeCounts }[];
  suppliers: {
    id: string;
    name: string;
    days: { day: string; mean: number; warmest: number; loads: number }[];
    disputed: { day: string; value: number; caseNumber: string; status: string }[];
  }[];
  upperLimit: number | null;
  historyDays: number;
};

const empty = (): OutcomeCounts => ({ uphold: 0, reverse: 0, adjust: 0 });
function add(counts: OutcomeCounts, outcome: string) {
  if (outcome === 'uphold' || outcome === 'reverse' || outcome === 'adjust') counts[outcome] += 1;
}

/**
 * The board's overview of its own cases: how its decisions fall by outcome over time, by referee
 * laboratory and by the plant instrument that made the contested intake result (a result reversed
 * often points at that instrument), and the freezing-point history of each supplier that has a case
 * before the board, as daily means and warmest loads against the limit. Superseded decisions count
 * once, as corrected.
 */
export async function boardOverview(db: DbOrTx, actor: Actor, options: { historyDays?: number; now?: Date } = {}): Promise<BoardOverview> {
  if (!can(actor.role, 'case', 'decide')) throw new AppError('not_found', 'That page was not found.');
  const historyDays = options.historyDays ?? 60;
  const now = options.now ?? new Date();
  const board = actor.organisationId;

  const rows = await db
    .select({
      id: decision.id,
      outcome: decision.outcome,
      signedAt: decision.signedAt,
      supersedesId: decision.supersedesId,
      laboratory: organisation.name,
      instrumentSerial: instrument.serialNumber,
      instrumentDescription: instrument.description,
    })
    .from(decision)
    .innerJoin(disputeCase, eq(disputeCase.id, decision.caseId))
    .innerJoin(intakeResult, eq(intakeResult.id, disputeCase.intakeResultId))
    .innerJoin(measurementSet, eq(measurementSet.id, intakeResult.measurementSetId))
    .innerJoin(instrument, eq(instrument.id, measurementSet.instrumentId))
    .leftJoin(organisation, eq(organisation.id, disputeCase.labOrganisationId))
    .where(eq(disputeCase.boardOrganisationId, board))
    .orderBy(asc(decision.signedAt));
  const superseded = new Set(rows.map((r) => r.supersedesId).filter((id): id is string => id !== null));
  const current = rows.filter((r) => !superseded.has(r.id));

  const months = new Map<string, OutcomeCounts>();
  const labs = new Map<string, OutcomeCounts>();
  const instruments = new Map<string, { months: Map<string, OutcomeCounts>; total: OutcomeCounts }>();
  for (const r of current) {
    const month = r.signedAt.toISOString().slice(0, 7);
    if (!months.has(month)) months.set(month, empty());
    add(months.get(month)!, r.outcome);
    const lab = r.laboratory ?? 'no laboratory';
    if (!labs.has(lab)) labs.set(lab, empty());
    add(labs.get(lab)!, r.outcome);
    const name = `${r.instrumentSerial} · ${r.instrumentDescription}`;
    if (!instruments.has(name)) instruments.set(name, { months: new Map(), total: empty() });
    const entry = instruments.get(name)!;
    if (!entry.months.has(month)) entry.months.set(month, empty());
    add(entry.months.get(month)!, r.outcome);
    add(entry.total, r.outcome);
  }

  const supplierRows = await db
    .selectDistinct({ id: organisation.id, name: organisation.name })
    .from(disputeCase)
    .innerJoin(organisation, eq(organisation.id, disputeCase.supplierOrganisationId))
    .where(eq(disputeCase.boardOrganisationId, board))
    .orderBy(asc(organisation.name));
  const supplierIds = supplierRows.map((s) => s.id);
  const since = new Date(now.getTime() - historyDays * DAY);
  const day = sql<string>`to_char(date_trunc('day', ${delivery.receivedAt} at time zone 'UTC'), 'YYYY-MM-DD')`;
  const [daily, disputed, rules] = await Promise.all([
    supplierIds.length
      ? db
          .select({
            supplierId: delivery.supplierOrganisationId,
            day,
            mean: sql<string>`avg(${intakeResult.valueTenthMilliC})`,
            warmest: sql<number>`max(${intakeResult.valueTenthMilliC})`,
            loads: sql<number>`count(*)`,
          })
          .from(intakeResult)
          .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
          .where(and(inArray(delivery.supplierOrganisationId, supplierIds), isNull(intakeResult.supersededAt), gte(delivery.receivedAt, since)))
          .groupBy(delivery.supplierOrganisationId, day)
          .orderBy(day)
      : [],
    db
      .select({ supplierId: disputeCase.supplierOrganisationId, day, value: intakeResult.valueTenthMilliC, caseNumber: disputeCase.number, status: disputeCase.status })
      .from(disputeCase)
      .innerJoin(intakeResult, eq(intakeResult.id, disputeCase.intakeResultId))
      .innerJoin(delivery, eq(delivery.id, disputeCase.deliveryId))
      .where(and(eq(disputeCase.boardOrganisationId, board), gte(delivery.receivedAt, since)))
      .orderBy(day),
    rulesInForce(db, now),
  ]);

  const [boardRow] = await db.select({ name: organisation.name }).from(organisation).where(eq(organisation.id, board));
  const counts = (map: Map<string, OutcomeCounts>) => [...map].map(([key, value]) => ({ key, ...value }));
  return {
    boardName: boardRow?.name ?? actor.organisationName,
    decided: current.length,
    byMonth: counts(months).map(({ key, ...c }) => ({ month: key, ...c })),
    byLaboratory: counts(labs).map(({ key, ...c }) => ({ laboratory: key, ...c })),
    byInstrument: [...instruments].map(([name, entry]) => ({ instrument: name, months: counts(entry.months).map(({ key, ...c }) => ({ month: key, ...c })), total: entry.total })),
    suppliers: supplierRows.map((s) => ({
      id: s.id,
      name: s.name,
      days: daily.filter((d) => d.supplierId === s.id).map((d) => ({ day: d.day, mean: fromTenthMilliC(Math.round(Number(d.mean))), warmest: fromTenthMilliC(Number(d.warmest)), loads: Number(d.loads) })),
      disputed: disputed.filter((d) => d.supplierId === s.id).map((d) => ({ day: d.day, value: fromTenthMilliC(d.value), caseNumber: d.caseNumber, status: d.status })),
    })),
    upperLimit: rules?.rules.limits.upper ?? null,
    historyDays,
  };
}
