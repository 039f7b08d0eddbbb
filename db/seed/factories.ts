import { eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { organisation, schemeRules, supplierFarm, user, type OrganisationKind } from '@/db/schema';
import { getAuth } from '@/lib/auth/auth';
import type { Role } from '@/lib/auth/permissions';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import type { SchemeRules } from '@/lib/rules/schema';

/** Building blocks shared by the demo seed and the tests. */
export async function createOrganisation(db: DbOrTx, input: { name: string; kind: OrganisationKind; contactEmail?: string }) {
  const [row] = await db.insert(organisation).values(input).returning();
  return row;
}

export async function createFarm(db: DbOrTx, input: { organisationId: string; name: string; herdCode: string; contactEmail?: string }) {
  const [row] = await db.insert(supplierFarm).values(input).returning();
  return row;
}

/** Creates a user with a password through better-auth, so the hash and account rows are its own. */
export async function createUserWithPassword(
  db: DbOrTx,
  input: { email: string; name: string; role: Role; organisationId: string; password: string },
) {
  await getAuth().api.createUser({
    body: {
      email: input.email,
      name: input.name,
      password: input.password,
      role: input.role,
      data: { organisationId: input.organisationId, emailVerified: true },
    },
  });
  const [row] = await db.select({ id: user.id, email: user.email }).from(user).where(eq(user.email, input.email.toLowerCase()));
  return row;
}

export async function createRulesVersion(
  db: DbOrTx,
  input: { version: number; effectiveFrom: Date; rules?: SchemeRules; note?: string; createdBy?: string },
) {
  const [row] = await db
    .insert(schemeRules)
    .values({ version: input.version, effectiveFrom: input.effectiveFrom, rules: input.rules ?? defaultSchemeRules, note: input.note, createdBy: input.createdBy })
    .returning();
  return row;
}
