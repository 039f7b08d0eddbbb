import { canonicalJson, sha256Hex } from '@/lib/canonical-json';

export const GENESIS_HASH = '0'.repeat(64);

/** The fields a row's hash covers: everything but its sequence number and the hash itself. */
export type ChainedContent = {
  at: string;
  actorUserId: string | null;
  actorOrganisationId: string | null;
  action: string;
  objectType: string;
  objectId: string;
  caseId: string | null;
  change: unknown;
  origin: string | null;
  prevHash: string;
};

export function hashAuditContent(content: ChainedContent): string {
  return sha256Hex(canonicalJson(content));
}
