import { z } from 'zod';

/**
 * Every kind of audit event the product writes. Adding a kind here is how a new change becomes
 * auditable; `change` holds what changed, never secrets (no passwords, tokens or hashes of them).
 */
const base = { objectId: z.string().min(1), caseId: z.uuid().optional() };

export const auditEventSchema = z.discriminatedUnion('action', [
  z.object({ ...base, action: z.literal('organisation.created'), objectType: z.literal('organisation'), change: z.object({ name: z.string(), kind: z.string() }) }),
  z.object({ ...base, action: z.literal('invitation.created'), objectType: z.literal('invitation'), change: z.object({ email: z.string(), role: z.string(), organisationId: z.string() }) }),
  z.object({ ...base, action: z.literal('invitation.revoked'), objectType: z.literal('invitation'), change: z.object({ email: z.string() }) }),
  z.object({ ...base, action: z.literal('invitation.accepted'), objectType: z.literal('user'), change: z.object({ email: z.string(), role: z.string(), organisationId: z.string() }) }),
  z.object({ ...base, action: z.literal('user.created'), objectType: z.literal('user'), change: z.object({ email: z.string(), role: z.string(), organisationId: z.string() }) }),
  z.object({ ...base, action: z.literal('session.revoked'), objectType: z.literal('session'), change: z.object({ userId: z.string() }) }),
  z.object({ ...base, action: z.literal('rules.version_created'), objectType: z.literal('scheme_rules'), change: z.object({ version: z.number(), effectiveFrom: z.string() }) }),
  z.object({ ...base, action: z.literal('case.opened'), objectType: z.literal('case'), change: z.object({ number: z.string(), status: z.string() }) }),
  z.object({ ...base, action: z.literal('case.transitioned'), objectType: z.literal('case'), change: z.object({ from: z.string(), to: z.string(), transition: z.string(), detail: z.record(z.string(), z.unknown()).optional() }) }),
  z.object({ ...base, action: z.literal('instrument.created'), objectType: z.literal('instrument'), change: z.object({ serialNumber: z.string(), organisationId: z.string() }) }),
  z.object({ ...base, action: z.literal('calibration.checked'), objectType: z.literal('calibration_check'), change: z.object({ instrumentId: z.string(), nominalTenthMilliC: z.number(), within: z.number(), total: z.number(), pass: z.boolean(), rulesVersion: z.number() }) }),
  z.object({ ...base, action: z.literal('intake.recorded'), objectType: z.literal('intake_result'), change: z.object({ deliveryId: z.string(), reference: z.string(), verdict: z.string(), valueTenthMilliC: z.number(), amountMinor: z.number(), rulesVersion: z.number(), calibrationCheckId: z.string().nullable(), calibrationWarning: z.string().nullable(), notifiedAt: z.string().nullable() }) }),
  z.object({ ...base, action: z.literal('intake.corrected'), objectType: z.literal('intake_result'), change: z.object({ deliveryId: z.string(), supersedes: z.string(), reason: z.string(), from: z.object({ verdict: z.string(), valueTenthMilliC: z.number(), amountMinor: z.number() }), to: z.object({ verdict: z.string(), valueTenthMilliC: z.number(), amountMinor: z.number() }), rulesVersion: z.number(), notifiedAt: z.string().nullable() }) }),
  z.object({ ...base, action: z.literal('decision.sealed'), objectType: z.literal('decision'), change: z.object({ outcome: z.string(), followedProposal: z.boolean(), recordSha256: z.string(), signingKeyId: z.string(), signatureMeaning: z.string(), reauthenticationMethod: z.string(), supersedesId: z.string().nullable(), correctionReason: z.string().nullable() }) }),
  z.object({ ...base, action: z.literal('decision.letter_issued'), objectType: z.literal('decision'), change: z.object({ letterSha256: z.string(), bytes: z.number(), recordSha256: z.string() }) }),
  // File names, captions and reasons may quote values: they sit under `detail`, which the blind laboratory's ledger withholds.
  z.object({ ...base, action: z.literal('evidence.uploaded'), objectType: z.literal('attachment'), change: z.object({ kind: z.string(), detail: z.object({ fileName: z.string(), caption: z.string().nullable(), contentType: z.string(), sizeBytes: z.number(), sha256: z.string(), storageKey: z.string(), thumbnailKey: z.string().nullable() }) }) }),
  z.object({ ...base, action: z.literal('evidence.removed'), objectType: z.literal('attachment'), change: z.object({ kind: z.string(), detail: z.object({ fileName: z.string(), sha256: z.string(), reason: z.string() }) }) }),
  // A note's words stay out of the trail, which every party reads: its hash proves which body it was.
  z.object({ ...base, action: z.literal('note.created'), objectType: z.literal('note'), change: z.object({ visibility: z.enum(['parties', 'internal']), parentId: z.string().nullable(), bodySha256: z.string(), mentions: z.number() }) }),
  z.object({ ...base, action: z.literal('note.edited'), objectType: z.literal('note'), change: z.object({ visibility: z.enum(['parties', 'internal']), revisionId: z.string(), previousSha256: z.string(), bodySha256: z.string() }) }),
  z.object({ ...base, action: z.literal('demo.seeded'), objectType: z.literal('system'), change: z.object({ organisations: z.number(), deliveries: z.number(), cases: z.number() }) }),
]);

export type AuditEventInput = z.infer<typeof auditEventSchema>;
export type AuditAction = AuditEventInput['action'];
