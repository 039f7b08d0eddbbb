import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { getDb } from '@/db/client';
import { custodyEvent, disputeCase, sample } from '@/db/schema';
import { countedOf, writesAsOne } from '@/db/writes-as-one';
import { seedDemoForTests } from './helpers';

let caseRow: typeof disputeCase.$inferSelect;
let sampleRow: typeof sample.$inferSelect;

beforeAll(async () => {
  await seedDemoForTests();
  const db = getDb();
  [caseRow] = await db.select().from(disputeCase).limit(1);
  [sampleRow] = await db.select().from(sample).where(eq(sample.deliveryId, caseRow.deliveryId)).limit(1);
});

const custodyOf = (sampleId: string) => getDb().select().from(custodyEvent).where(eq(custodyEvent.sampleId, sampleId));
const custodyInsert = (sampleId: string, note: string) =>
  getDb().insert(custodyEvent).values({ sampleId, kind: 'sealed', at: new Date('2026-11-20T08:00:00Z'), organisationId: caseRow.plantOrganisationId, note });

describe('writes sent as one statement', () => {
  it('makes every write and answers how many rows the first returned', async () => {
    const db = getDb();
    const before = (await custodyOf(sampleRow.id)).length;
    const stamp = new Date('2026-11-21T09:30:00Z');
    const update = db.update(disputeCase).set({ updatedAt: stamp }).where(eq(disputeCase.id, caseRow.id)).returning({ id: disputeCase.id });
    const result = await db.execute(writesAsOne(update, [custodyInsert(sampleRow.id, 'first of two'), custodyInsert(sampleRow.id, 'second of two')]));
    expect(countedOf(result)).toBe(1);
    const [after] = await db.select({ updatedAt: disputeCase.updatedAt }).from(disputeCase).where(eq(disputeCase.id, caseRow.id));
    expect(after.updatedAt.toISOString()).toBe(stamp.toISOString());
    const notes = (await custodyOf(sampleRow.id)).map((c) => c.note);
    expect(notes).toHaveLength(before + 2);
    expect(notes).toEqual(expect.arrayContaining(['first of two', 'second of two']));
  });

  it('answers 0 when the first write matches no row', async () => {
    const db = getDb();
    const update = db.update(disputeCase).set({ updatedAt: new Date() }).where(eq(disputeCase.id, '00000000-0000-4000-8000-000000000000')).returning({ id: disputeCase.id });
    expect(countedOf(await db.execute(writesAsOne(update, [])))).toBe(0);
  });

  it('makes none of them when one fails', async () => {
    const db = getDb();
    const [before] = await db.select({ updatedAt: disputeCase.updatedAt }).from(disputeCase).where(eq(disputeCase.id, caseRow.id));
    const custodyBefore = (await custodyOf(sampleRow.id)).length;
    const update = db.update(disputeCase).set({ updatedAt: new Date('2030-01-01T00:00:00Z') }).where(eq(disputeCase.id, caseRow.id)).returning({ id: disputeCase.id });
    // A custody event of a sample that does not exist breaks its foreign key.
    const failing = writesAsOne(update, [custodyInsert(sampleRow.id, 'must not stay'), custodyInsert('00000000-0000-4000-8000-000000000000', 'orphan')]);
    await expect(db.execute(failing)).rejects.toThrow();
    const [after] = await db.select({ updatedAt: disputeCase.updatedAt }).from(disputeCase).where(eq(disputeCase.id, caseRow.id));
    expect(after.updatedAt.toISOString()).toBe(before.updatedAt.toISOString());
    expect(await custodyOf(sampleRow.id)).toHaveLength(custodyBefore);
  });
});
