import { eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { organisation } from '@/db/schema';

export type KnownOrganisation = Pick<typeof organisation.$inferSelect, 'id' | 'name' | 'kind'>;

// Organisations are only ever added (createOrganisation), never edited or removed, so a row read
// once holds for the life of the process: every request that resolves its actor, and every
// dispatch that names a laboratory, is spared a query.
const organisationsById = new Map<string, KnownOrganisation>();

/** One organisation by id. Pass the open transaction when there is one: on the embedded database a second connection would wait for it. */
export async function organisationById(db: DbOrTx, id: string): Promise<KnownOrganisation | null> {
  const known = organisationsById.get(id);
  if (known) return known;
  const [row] = await db.select({ id: organisation.id, name: organisation.name, kind: organisation.kind }).from(organisation).where(eq(organisation.id, id));
  if (row) organisationsById.set(id, row);
  return row ?? null;
}
