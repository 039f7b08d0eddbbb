import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { requireActor } from '@/lib/auth/session';
import { getCaseFile } from '@/lib/dal/case-file';
import { isAppError } from '@/lib/errors';
import { PageHeader, Card } from '@/components/ui/card';
import { CaseStatusBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { ContestedResult, Readings, SamplesAndCustody } from '@/components/cases/case-sections';
import { DecisionSection, Evidence, Ledger, Notes } from '@/components/cases/case-record-sections';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Case file' };

async function loadCase(caseId: string) {
  const actor = await requireActor();
  if (!z.uuid().safeParse(caseId).success) notFound();
  try {
    return await getCaseFile(getDb(), actor, caseId);
  } catch (error) {
    if (isAppError(error) && error.code === 'not_found') notFound();
    throw error;
  }
}

export default async function CaseFilePage({ params }: { params: Promise<{ caseId: string }> }) {
  const { caseId } = await params;
  const file = await loadCase(caseId);
  const live = file.status !== 'decided' && file.status !== 'withdrawn';
  return (
    <>
      <PageHeader eyebrow="Case file" title={<span className="flex flex-wrap items-center gap-3">{file.number} <CaseStatusBadge status={file.status} /></span>} />
      <div className="mb-6 grid gap-4 md:grid-cols-[2fr_1fr]">
        <Card>
          <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-2">
            <div><dt className="font-bold text-brine">Supplier</dt><dd>{file.parties.supplier}</dd></div>
            <div><dt className="font-bold text-brine">Plant</dt><dd>{file.parties.plant}</dd></div>
            <div><dt className="font-bold text-brine">Referee laboratory</dt><dd>{file.parties.lab ?? 'not yet assigned'}</dd></div>
            <div><dt className="font-bold text-brine">Board</dt><dd>{file.parties.board}</dd></div>
            <div><dt className="font-bold text-brine">Opened</dt><dd className="num">{formatDateTime(file.openedAt)}</dd></div>
          </dl>
        </Card>
        <Card title="Deadlines">
          {live ? (
            <div className="grid gap-2">
              {file.status === 'open' ? <Deadline label="Dispatch the sample by" due={file.deadlines.dispatchDueAt} /> : null}
              {file.status !== 'review' ? <Deadline label="Sample valid until" due={file.deadlines.sampleValidUntil} /> : null}
              {file.status === 'review' ? <Deadline label="Decision due" due={file.deadlines.decisionDueAt} /> : null}
            </div>
          ) : (
            <p className="text-sm text-brine">{file.status === 'decided' ? `Decided ${file.decidedAt ? formatDateTime(file.decidedAt) : ''}` : `Withdrawn ${file.withdrawnAt ? formatDateTime(file.withdrawnAt) : ''}`}</p>
          )}
        </Card>
      </div>
      <div className="grid gap-6">
        <ContestedResult file={file} />
        <Readings file={file} />
        <SamplesAndCustody file={file} />
        <Evidence file={file} />
        <Notes file={file} />
        <DecisionSection file={file} />
        <Ledger file={file} />
      </div>
    </>
  );
}
