import { File, FileImage, FileSpreadsheet, FileText } from 'lucide-react';
import type { CaseAttachment } from '@/lib/dal/attachments';
import { formatBytes, kindRules } from '@/lib/evidence/kinds';
import { formatDateTime } from '@/lib/format/dates';
import { Badge } from '@/components/ui/status';
import { CopyHash } from './copy-hash';
import { WithdrawEvidence } from './withdraw-evidence';

function fileUrl(caseId: string, attachmentId: string, thumbnail = false): string {
  return `/api/v1/cases/${caseId}/attachments/${attachmentId}${thumbnail ? '/thumbnail' : ''}`;
}

function TypeIcon({ contentType }: { contentType: string }) {
  const Icon = contentType === 'application/pdf' ? FileText : contentType === 'text/csv' ? FileSpreadsheet : contentType.startsWith('image/') ? FileImage : File;
  const label = contentType === 'application/pdf' ? 'PDF' : contentType === 'text/csv' ? 'CSV' : contentType === 'text/plain' ? 'Text' : contentType.startsWith('image/') ? 'Image' : 'File';
  return (
    <span className="flex h-full w-full flex-col items-center justify-center gap-1 text-brine">
      <Icon aria-hidden="true" size={36} strokeWidth={1.5} />
      <span className="text-xs font-bold">{label}</span>
    </span>
  );
}

function Preview({ caseId, file }: { caseId: string; file: CaseAttachment }) {
  return (
    <div className="flex h-28 w-28 shrink-0 items-center justify-center overflow-hidden rounded-control border border-line bg-paper">
      {file.hasThumbnail ? (
        // A signed, short-lived link behind our own route: next/image would cache and re-serve it.
        <img src={fileUrl(caseId, file.id, true)} alt={`Preview of ${file.fileName}`} loading="lazy" className="h-full w-full object-cover" />
      ) : (
        <TypeIcon contentType={file.contentType} />
      )}
    </div>
  );
}

/** The files of a case with what a reviewer checks first: who added what, when, and its hash. */
export function EvidenceGallery({ caseId, files }: { caseId: string; files: CaseAttachment[] }) {
  return (
    <ul className="grid gap-3 lg:grid-cols-2" data-testid="evidence-gallery">
      {files.map((file) => {
        const removed = file.removedAt !== null;
        return (
          <li key={file.id} data-attachment-id={file.id} data-removed={removed || undefined} className={`flex gap-3 rounded-card border p-3 ${removed ? 'border-dashed border-line bg-paper-deep/60' : 'border-line bg-white'}`}>
            <Preview caseId={caseId} file={file} />
            <div className="grid min-w-0 flex-1 content-start gap-1 text-sm">
              <p className="flex flex-wrap items-center gap-2">
                <span className={`break-all font-bold ${removed ? 'text-brine line-through' : 'text-ink'}`}>{file.fileName}</span>
                <Badge tone="neutral">{kindRules[file.kind].label}</Badge>
                {removed ? <Badge tone="warning">Withdrawn</Badge> : null}
              </p>
              {file.caption ? <p className={removed ? 'text-brine line-through' : ''}>{file.caption}</p> : null}
              <p className="text-xs text-brine">
                <span className="num">{formatBytes(file.sizeBytes)}</span> · {file.uploaderName}, {file.organisation} · <time dateTime={file.createdAt.toISOString()}>{formatDateTime(file.createdAt)}</time>
              </p>
              <div className="grid gap-0.5 text-xs text-brine">
                <span className="font-bold">SHA-256</span>
                <CopyHash sha256={file.sha256} fileName={file.fileName} />
              </div>
              {removed ? (
                <p className="text-xs text-ink-soft">
                  Withdrawn by {file.removedByName ?? 'its uploader'} on {formatDateTime(file.removedAt!)}
                  {file.removalReason ? `: ${file.removalReason}` : '.'} {file.downloadable ? 'The board keeps it in the record.' : 'Only the board can still open it.'}
                </p>
              ) : null}
              {file.downloadable ? (
                <p>
                  <a href={fileUrl(caseId, file.id)} className="font-bold" aria-label={`Download ${file.fileName}`}>
                    Download
                  </a>
                </p>
              ) : null}
              {file.removable ? <WithdrawEvidence caseId={caseId} attachmentId={file.id} fileName={file.fileName} /> : null}
            </div>
          </li>
        );
      })}
    </ul>
  );
}
