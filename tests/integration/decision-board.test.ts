import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { World } from './support/lifecycle';

const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, eq, gte, isNull } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { delivery, intakeResult } = await import('@/db/schema');
const { boardOverview } = await import('@/lib/dal/decision-board');
const { signDecision, correctDecision } = await import('@/lib/dal/decision-sign');
const { runTransition } = await import('@/lib/dal/case-transition');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { TEST_PASSWORD } = await import('./helpers');
const L = await import('./support/lifecycle');

let world: World;
const DAY = 86_400_000;

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('the board overview', () => {
  it('counts the seeded decisions by outcome, laboratory and plant instrument, for the board’s own arbiters', async () => {
    const overview = await boardOverview(getDb(), world.actors.arbiter);
    // The demo scenario seals one upheld and one reversed decision, both retested at Eskmere.
    expect(overview.decided).toBe(2);
    expect(overview.byLaboratory).toEqual([{ laboratory: 'Eskmere Regional Dairy Laboratory', uphold: 1, reverse: 1, adjust: 0 }]);
    expect(overview.byMonth.reduce((n, m) => n + m.uphold + m.reverse + m.adjust, 0)).toBe(2);
    expect(overview.byInstrument.flatMap((i) => i.instrument).every((name) => name.startsWith('LW-CRY-'))).toBe(true);
    expect(overview.byInstrument.reduce((n, i) => n + i.total.uphold + i.total.reverse, 0)).toBe(2);
    expect(overview.upperLimit).toBe(-0.515);
  });

  it('counts a new decision, and a corrected one once, as corrected', async () => {
    const before = await boardOverview(getDb(), world.actors.arbiter);
    const c = await L.freshCaseIn(world, 'retest');
    await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world, { readings: [{ value: -0.5038 }, { value: -0.5042 }] }));
    const signed = await signDecision(getDb(), world.actors.arbiter, c.id, { outcome: 'uphold', reasons: 'Both laboratories agree; beyond the limit with the guard band.', confirm: true, password: TEST_PASSWORD });
    const once = await boardOverview(getDb(), world.actors.arbiter);
    expect(once.decided).toBe(before.decided + 1);
    const lab = (o: typeof once) => o.byLaboratory.find((l) => l.laboratory === 'Eskmere Regional Dairy Laboratory')!;
    expect(lab(once).uphold).toBe(lab(before).uphold + 1);

    await correctDecision(getDb(), world.actors.arbiter2, c.id, {
      supersedesId: signed.decisionId,
      outcome: 'reverse',
      reasons: 'The seal record belonged to another load, so the intake result cannot stand.',
      departureReason: 'The seal mix-up lies outside what the module sees.',
      correctionReason: 'The custody record of another load was read as this one’s.',
      confirm: true,
      password: TEST_PASSWORD,
    });
    const corrected = await boardOverview(getDb(), world.actors.arbiter);
    expect(corrected.decided).toBe(once.decided);
    expect(lab(corrected)).toMatchObject({ uphold: lab(before).uphold, reverse: lab(before).reverse + 1 });
  });

  it('shows each supplier with a case before the board, its daily intake results against the limit and its disputed loads', async () => {
    const overview = await boardOverview(getDb(), world.actors.arbiter, { historyDays: 60 });
    expect(overview.suppliers.map((s) => s.name).sort()).toEqual(['Hollin Brook Farms Association', 'Upper Larch Producers’ Group']);
    const upper = overview.suppliers.find((s) => s.id === world.org.supplier)!;
    const since = new Date(Date.now() - 60 * DAY);
    const results = await getDb()
      .select({ value: intakeResult.valueTenthMilliC })
      .from(intakeResult)
      .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
      .where(and(eq(delivery.supplierOrganisationId, world.org.supplier), isNull(intakeResult.supersededAt), gte(delivery.receivedAt, since)));
    expect(upper.days.reduce((n, d) => n + d.loads, 0)).toBe(results.length);
    expect(Math.max(...upper.days.map((d) => d.warmest))).toBe(Math.max(...results.map((r) => r.value)) / 10_000);
    for (const d of upper.days) expect(d.warmest).toBeGreaterThanOrEqual(d.mean);
    expect(upper.disputed.filter((d) => d.status === 'review').length).toBeGreaterThan(0);
    for (const d of upper.disputed) expect(d.caseNumber).toMatch(/^CS-\d{4}-\d{4}$/);
  });

  it('shows another board nothing of this one, and no other role the page at all', async () => {
    const other = await boardOverview(getDb(), world.actors.otherArbiter);
    expect(other).toMatchObject({ decided: 0, byMonth: [], byLaboratory: [], byInstrument: [], suppliers: [] });
    for (const key of ['admin', 'supplier', 'plant', 'lab'] as const) await L.expectAppError(boardOverview(getDb(), world.actors[key]), 'not_found');
  });
});
