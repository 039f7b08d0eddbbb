import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import type { CaseFile } from '@/lib/dal/case-file';
import { closedReason } from '@/lib/dal/attachments';
import { Card, EmptyState } from '@/components/ui/card';
import { EvidenceGallery } from './evidence-gallery';
import { AddEvidence } from './add-evidence';

/** The Case file's evidence: the gallery for everyone on the case, the uploader for the parties while it is open. */
export function EvidenceSection({ file, actor }: { file: CaseFile; actor: Actor }) {
  const closed = closedReason(file.status);
  const uploader = can(actor.role, 'evidence', 'upload') && !closed;
  const withdrawn = file.attachments.filter((a) => a.removedAt !== null).length;
  return (
    <Card id="evidence" title="Evidence" actions={file.attachments.length ? <span className="text-sm text-brine">{`${file.attachments.length} file${file.attachments.length === 1 ? '' : 's'}${withdrawn ? `, ${withdrawn} withdrawn` : ''}`}</span> : null}>
      <div className="grid gap-4">
        {file.blind ? (
          <p className="text-sm text-brine">You see your own laboratory’s files only until your retest is submitted; the other parties’ files may show the intake readings.</p>
        ) : null}
        {file.attachments.length === 0 ? (
          <EmptyState title="No files attached to this case">{uploader ? 'Lab sheets, certificates, photos and letters added here are checked by content and kept with their SHA-256.' : null}</EmptyState>
        ) : (
          <EvidenceGallery caseId={file.id} files={file.attachments} />
        )}
        {uploader ? <AddEvidence caseId={file.id} /> : closed && can(actor.role, 'evidence', 'upload') ? <p className="text-sm text-brine">{closed}</p> : null}
      </div>
    </Card>
  );
}
