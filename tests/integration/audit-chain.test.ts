import { beforeAll, describe, expect, it } from 'vitest';
import { asc, count, desc, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { auditEvent } from '@/db/schema';
import { verifyAuditChain } from '@/lib/audit/verify';
import { chainedRow, recordAudit } from '@/lib/audit/record';
import { seedDemoForTests } from './helpers';

type Row = typeof auditEvent.$inferSelect;
let rows: Row[];

/** Each tampering test puts the row back and checks here that the whole chain holds again. */
async function expectIntactChain(): Promise<number> {
  const verdict = await verifyAuditChain(getDb());
  expect(verdict).toEqual({ ok: true, checked: rows.length });
  return verdict.checked;
}

beforeAll(async () => {
  await seedDemoForTests();
  rows = await getDb().select().from(auditEvent).orderBy(asc(auditEvent.seq));
});

describe('the audit chain', () => {
  it('holds after seeding the demo, row by row', async () => {
    expect(rows.length).toBeGreaterThan(20);
    expect(await expectIntactChain()).toBe(rows.length);
  });

  it('verifies across page boundaries the same way', async () => {
    expect(await verifyAuditChain(getDb(), 3)).toEqual({ ok: true, checked: rows.length });
  });

  it("catches an edited row's change and names its seq", async () => {
    const target = rows[Math.floor(rows.length / 2)];
    await getDb().execute(sql`update audit_event set change = jsonb_set(change, '{tampered}', 'true'::jsonb) where seq = ${target.seq}`);
    const verdict = await verifyAuditChain(getDb());
    expect(verdict.ok).toBe(false);
    if (verdict.ok) return;
    expect(verdict.brokenAt).toBe(target.seq);
    expect(verdict.reason).toMatch(/edited/);
    expect(verdict.checked).toBe(rows.findIndex((r) => r.seq === target.seq));

    await getDb().execute(sql`update audit_event set change = ${JSON.stringify(target.change)}::jsonb where seq = ${target.seq}`);
    await expectIntactChain();
  });

  it('catches an edited actor or time, not only the change', async () => {
    const target = rows[3];
    await getDb().execute(sql`update audit_event set at = at + interval '1 second' where seq = ${target.seq}`);
    const verdict = await verifyAuditChain(getDb());
    expect(verdict).toMatchObject({ ok: false, brokenAt: target.seq });
    await getDb().execute(sql`update audit_event set at = ${target.at.toISOString()}::timestamptz where seq = ${target.seq}`);
    await expectIntactChain();
  });

  it('catches a row edited together with a recomputed own hash, at the row after it', async () => {
    // Someone who knows the hashing can make the edited row consistent in itself; the next row's link still breaks.
    const { hashAuditContent } = await import('@/lib/audit/chain');
    const index = 5;
    const target = rows[index];
    const forgedChange = { ...(target.change as Record<string, unknown>), forged: true };
    const forgedHash = hashAuditContent({
      at: target.at.toISOString(),
      actorUserId: target.actorUserId,
      actorOrganisationId: target.actorOrganisationId,
      action: target.action,
      objectType: target.objectType,
      objectId: target.objectId,
      caseId: target.caseId,
      change: forgedChange,
      origin: target.origin,
      prevHash: target.prevHash,
    });
    await getDb().execute(sql`update audit_event set change = ${JSON.stringify(forgedChange)}::jsonb, hash = ${forgedHash} where seq = ${target.seq}`);
    const verdict = await verifyAuditChain(getDb());
    expect(verdict).toMatchObject({ ok: false, brokenAt: rows[index + 1].seq });
    await getDb().execute(sql`update audit_event set change = ${JSON.stringify(target.change)}::jsonb, hash = ${target.hash} where seq = ${target.seq}`);
    await expectIntactChain();
  });

  it('catches a deleted row at the row that followed it', async () => {
    const index = 10;
    const removed = rows[index];
    await getDb().execute(sql`delete from audit_event where seq = ${removed.seq}`);
    const verdict = await verifyAuditChain(getDb());
    expect(verdict.ok).toBe(false);
    if (verdict.ok) return;
    expect(verdict.brokenAt).toBe(rows[index + 1].seq);
    expect(verdict.reason).toMatch(/removed/);
    expect(verdict.checked).toBe(index);

    await getDb().insert(auditEvent).values(removed);
    await expectIntactChain();
  });

  it('keeps linking new events after the seed', async () => {
    await recordAudit(getDb(), { actorUserId: null, actorOrganisationId: null, origin: 'integration test' }, {
      action: 'demo.seeded',
      objectType: 'system',
      objectId: 'test',
      change: { organisations: 0, deliveries: 0, cases: 0 },
    });
    const [{ n }] = await getDb().select({ n: count() }).from(auditEvent);
    expect(await verifyAuditChain(getDb())).toEqual({ ok: true, checked: n });
    expect(n).toBe(rows.length + 1);
  });

  it('links to the last committed event when the event this process wrote last was rolled back', async () => {
    const seeded = { action: 'demo.seeded', objectType: 'system', objectId: 'test', change: { organisations: 0, deliveries: 0, cases: 0 } } as const;
    const context = { actorUserId: null, actorOrganisationId: null, origin: 'integration test' };
    const refused = new Error('the change this event recorded was refused');
    await expect(
      getDb().transaction(async (tx) => {
        await recordAudit(tx, context, seeded);
        throw refused;
      }),
    ).rejects.toBe(refused);
    const before = await getDb().select({ n: count() }).from(auditEvent);
    // The process's guess at the head is now a hash that was never committed.
    await recordAudit(getDb(), context, seeded);
    await recordAudit(getDb(), context, seeded);
    const [{ n }] = await getDb().select({ n: count() }).from(auditEvent);
    expect(n).toBe(before[0].n + 2);
    expect(await verifyAuditChain(getDb())).toEqual({ ok: true, checked: n });
  });

  it('links to an event another process appended after this one last wrote', async () => {
    const context = { actorUserId: null, actorOrganisationId: null, origin: 'integration test' };
    const seeded = { action: 'demo.seeded', objectType: 'system', objectId: 'test', change: { organisations: 0, deliveries: 0, cases: 0 } } as const;
    await recordAudit(getDb(), context, seeded);
    // Another writer's event, chained as recordAudit chains it, without this process knowing.
    const [head] = await getDb().select({ hash: auditEvent.hash }).from(auditEvent).orderBy(desc(auditEvent.seq)).limit(1);
    await getDb().insert(auditEvent).values(chainedRow({ ...context, at: new Date() }, seeded, head.hash));
    await recordAudit(getDb(), context, seeded);
    const [{ n }] = await getDb().select({ n: count() }).from(auditEvent);
    expect(await verifyAuditChain(getDb())).toEqual({ ok: true, checked: n });
  });
});
