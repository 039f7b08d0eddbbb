import { eq } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { instrument, organisation } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { seedCase, type CaseParties, type DemoCasePlan } from './demo-cases';
import { seedDeliveries, type DemoFarm, type Incident } from './demo-deliveries';
import { demoDomain, demoFarmNames, demoOrganisations, demoUsers } from './demo-names';
import { createFarm, createOrganisation, createRulesVersion, createUserWithPassword } from './factories';
import { seededRandom } from './random';

const DAY = 86_400_000;

// Deliveries the cases rest on: which day, which farm (index into the farm list), and the intake readings.
const incidents: Incident[] = [
  { key: 'decidedUphold', daysAgo: 40, farmIndex: 2, readings: [-0.5032, -0.5047] },
  { key: 'decidedReverse', daysAgo: 25, farmIndex: 18, readings: [-0.511, -0.5106] },
  { key: 'withdrawn', daysAgo: 15, farmIndex: 5, readings: [-0.5105, -0.5112] },
  { key: 'review', daysAgo: 2, farmIndex: 7, readings: [-0.5021, -0.5008] },
  { key: 'retest', daysAgo: 1, farmIndex: 20, readings: [-0.5065, -0.5072] },
  { key: 'awaiting', daysAgo: 1, farmIndex: 9, readings: [-0.5102, -0.5109] },
  { key: 'open', daysAgo: 0, farmIndex: 3, readings: [-0.4995, -0.5006] },
  { key: 'contestable', daysAgo: 0, farmIndex: 11, readings: [-0.504, -0.5031] },
  { key: 'contestable2', daysAgo: 0, farmIndex: 22, readings: [-0.5104, -0.5111] },
];

const casePlans: DemoCasePlan[] = [
  {
    deliveryKey: 'decidedUphold', sequence: 1, status: 'decided', supplierKey: 'supplier', grounds: ['instrument'],
    explanation: 'Our own bulk-tank check that morning read −0.521 °C. We ask that the retained sample be retested.',
    remedy: 'Pay the load in full.', openedAfterNoticeHours: 5, retestReadings: [-0.5041, -0.5055],
    decision: { outcome: 'uphold', reasons: 'Both laboratories agree within the critical difference; the accepted value lies beyond the upper limit even with the guard band.' },
  },
  {
    deliveryKey: 'decidedReverse', sequence: 2, status: 'decided', supplierKey: 'supplier2', grounds: ['natural_variation'],
    explanation: 'The herd was moved to spring grazing two days before; its freezing point always rises for a week.',
    remedy: 'Cancel the deduction.', openedAfterNoticeHours: 3, retestReadings: [-0.5152, -0.5156],
    decision: { outcome: 'reverse', reasons: 'The two laboratories agree; their mean lies within the upper limit under guarded rejection.' },
  },
  {
    deliveryKey: 'withdrawn', sequence: 3, status: 'withdrawn', supplierKey: 'supplier', grounds: ['sampling'],
    explanation: 'The tanker driver sampled before the agitator had run for two minutes.', remedy: 'Cancel the deduction.', openedAfterNoticeHours: 2,
  },
  {
    deliveryKey: 'review', sequence: 4, status: 'review', supplierKey: 'supplier', grounds: ['instrument', 'natural_variation'],
    explanation: 'The cryoscope at intake had been recalibrated the day before; our herd has never read above −0.520 °C.',
    remedy: 'Pay the load in full and refund the referee fee.', openedAfterNoticeHours: 4,
    retestReadings: [-0.503, -0.5074, -0.504, -0.5046],
    notes: [
      { author: 'supplier', visibility: 'parties', text: 'The herd records for the last month are attached for the board.' },
      { author: 'plant', visibility: 'parties', text: 'The instrument passed its morning check on the −0.512 °C standard, 5 of 5 within tolerance.' },
      { author: 'plant', visibility: 'internal', text: 'Internal: check whether compartment 2 was rinsed before this collection.' },
    ],
  },
  {
    deliveryKey: 'retest', sequence: 5, status: 'retest', supplierKey: 'supplier2', grounds: ['sample_handling'],
    explanation: 'The routine sample stood in the sun on the intake bench for an hour.', remedy: 'Pay the load in full.', openedAfterNoticeHours: 2,
  },
  {
    deliveryKey: 'awaiting', sequence: 6, status: 'awaiting_sample', supplierKey: 'supplier', grounds: ['other'],
    explanation: 'Heavy rain overnight; we suspect a faulty tank lid, not added water, and ask for the retest.', remedy: 'Reduce the deduction to the measured share.', openedAfterNoticeHours: 1,
  },
  {
    deliveryKey: 'open', sequence: 7, status: 'open', supplierKey: 'supplier', grounds: ['instrument'],
    explanation: 'Our neighbours on the same round were all accepted that day.', remedy: 'Pay the load in full.', openedAfterNoticeHours: 0, openedHoursAgo: 1,
  },
];

export type DemoSeedResult = { seeded: boolean; accounts: { email: string; role: string; organisation: string }[] };

/** The invented demo scenario. Seeding twice changes nothing: the plant's presence means it is there. */
export async function seedDemo(db: Db, options: { password: string; now?: Date; days?: number }): Promise<DemoSeedResult> {
  const accounts = demoUsers.map((u) => ({
    email: u.email,
    role: u.role,
    organisation: typeof u.org === 'number' ? demoOrganisations.suppliers[u.org].name : demoOrganisations[u.org].name,
  }));
  const [existing] = await db.select({ id: organisation.id }).from(organisation).where(eq(organisation.name, demoOrganisations.plant.name));
  if (existing) return { seeded: false, accounts };

  const now = options.now ?? new Date();
  const days = options.days ?? 60;
  const random = seededRandom(20261201);

  const plant = await createOrganisation(db, demoOrganisations.plant);
  const lab = await createOrganisation(db, demoOrganisations.lab);
  const board = await createOrganisation(db, demoOrganisations.board);
  const suppliers: Awaited<ReturnType<typeof createOrganisation>>[] = [];
  for (const s of demoOrganisations.suppliers) suppliers.push(await createOrganisation(db, { name: s.name, kind: s.kind, contactEmail: s.contactEmail }));

  const rulesVersion = await createRulesVersion(db, { version: 1, effectiveFrom: new Date(now.getTime() - (days + 30) * DAY), note: 'Scheme rules agreed at the board’s founding meeting.' });

  const farms: DemoFarm[] = [];
  let farmNumber = 0;
  for (const [index, group] of demoOrganisations.suppliers.entries()) {
    for (let i = 0; i < group.farms; i++) {
      const name = `${demoFarmNames[farmNumber]} Farm`;
      const herdCode = `${group.prefix}-${String(101 + i)}`;
      const row = await createFarm(db, {
        organisationId: suppliers[index].id,
        name,
        herdCode,
        contactEmail: `${demoFarmNames[farmNumber].toLowerCase().replace(/[^a-z]+/g, '.')}@${demoDomain}`,
      });
      // Each herd has its own natural freezing point, as breed, feed and water access give it.
      farms.push({ id: row.id, organisationId: row.organisationId, herdCode, baseline: random.normal(-0.5265, 0.0035) });
      farmNumber++;
    }
  }

  const orgOf = (key: (typeof demoUsers)[number]['org']) => (typeof key === 'number' ? suppliers[key] : { plant, lab, board }[key]);
  const users: Record<string, { userId: string; organisationId: string; name: string }> = {};
  for (const u of demoUsers) {
    const org = orgOf(u.org);
    const created = await createUserWithPassword(db, { email: u.email, name: u.name, role: u.role, organisationId: org.id, password: options.password });
    users[u.key] = { userId: created.id, organisationId: org.id, name: u.name };
  }

  const [plantInstrumentA, plantInstrumentB, labInstrument] = await db
    .insert(instrument)
    .values([
      { organisationId: plant.id, serialNumber: 'LW-CRY-01', description: 'Intake cryoscope, bay 1' },
      { organisationId: plant.id, serialNumber: 'LW-CRY-02', description: 'Intake cryoscope, bay 2' },
      { organisationId: lab.id, serialNumber: 'ESK-CRY-07', description: 'Reference cryoscope, bench 2' },
    ])
    .returning();

  const { byKey, total } = await seedDeliveries(db, {
    now,
    days,
    farms,
    plantOrganisationId: plant.id,
    instrumentIds: [plantInstrumentA.id, plantInstrumentB.id],
    rules: defaultSchemeRules,
    rulesVersionId: rulesVersion.id,
    plantUserId: users.plant.userId,
    random,
    incidents,
  });

  const parties: CaseParties = {
    supplierUsers: { supplier: users.supplier, supplier2: users.supplier2 },
    plant: users.plant,
    lab: { ...users.lab, instrumentId: labInstrument.id },
    arbiter: users.arbiter,
    rulesVersionId: rulesVersion.id,
    rules: defaultSchemeRules,
  };
  for (const plan of casePlans) {
    const load = byKey.get(plan.deliveryKey);
    if (!load) throw new Error(`Demo delivery ${plan.deliveryKey} is missing`);
    await seedCase(db, plan, load, parties, now);
  }

  await recordAudit(db, { actorUserId: null, actorOrganisationId: null, origin: 'demo seed' }, {
    action: 'demo.seeded',
    objectType: 'system',
    objectId: 'demo',
    change: { organisations: 3 + suppliers.length, deliveries: total, cases: casePlans.length },
  });
  return { seeded: true, accounts };
}
