import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { requireActor } from '@/lib/auth/session';
import { getCaseFile } from '@/lib/dal/case-file';
import { caseWorkbench } from '@/lib/dal/case-workbench';
import { isAppError } from '@/lib/errors';
import { PageHeader, Card } from '@/components/ui/card';
import { CaseStatusBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { ContestedResult, Readings, SamplesAndCustody } from '@/components/cases/case-sections';
import { DecisionSection, Evidence, Ledger, Notes } from '@/components/cases/case-record-sections';
import { formatDateTime } from '@/lib/format/dates';
import { ReviewPanel } from '@/components/cases/review-panel';
import { DispatchForm } from '@/components/cases/forms/dispatch-form';
import { ReceiveForm } from '@/components/cases/forms/receive-form';
import { LazyBenchForm } from '@/components/cases/forms/lazy-bench-form';
import { FurtherTestForm } from '@/components/cases/forms/further-test-form';
import { WithdrawForm } from '@/components/cases/forms/withdraw-form';
import { FormMessage } from '@/components/ui/field';
import { isTransitionName } from '@/lib/cases/lifecycle';
import { successMessages } from '@/lib/cases/messages';
import { decisionPanel } from '@/lib/dal/decision-view';
import { DecisionForm } from '@/components/decision/decision-form';
import { SealedDecisions } from '@/components/decision/sealed-decision';

export const metadata: Metadata = { title: 'Case file' };

async function loadCase(caseId: string) {
  const actor = await requireActor();
  if (!z.uuid().safeParse(caseId).success) notFound();
  try {
    const db = getDb();
    const [file, bench] = await Promise.all([getCaseFile(db, actor, caseId), caseWorkbench(db, actor, caseId)]);
    // The board's form rests on the same proposal the workbench has just worked out.
    const panel = await decisionPanel(db, actor, caseId, { proposal: bench.proposal });
    return { file, bench, panel, actor };
  } catch (error) {
    if (isAppError(error) && error.code === 'not_found') notFound();
    throw error;
  }
}

export default async function CaseFilePage({ params, searchParams }: { params: Promise<{ caseId: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { caseId } = await params;
  const { opened, done, signed, corrected } = await searchParams;
  const { file, bench, panel, actor } = await loadCase(caseId);
  const rules = bench.rules;
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
        {opened ? <FormMessage tone="success">Your dispute {file.number} is open. The plant and the board have been told.</FormMessage> : null}
        {done && isTransitionName(done) ? <FormMessage tone="success">{successMessages[done]}</FormMessage> : null}
        {signed && panel.decisions.length ? <FormMessage tone="success">The decision is signed and the case sealed. The parties, the laboratory and the board have been sent the letter.</FormMessage> : null}
        {bench.allowed.includes('dispatch') ? <DispatchForm caseId={file.id} laboratories={bench.laboratories} sealNumber={bench.sample?.sealNumber ?? null} /> : null}
        {bench.allowed.includes('receive') ? <ReceiveForm caseId={file.id} sampleCode={bench.sample?.code ?? null} /> : null}
        {bench.allowed.includes('submit_retest') && rules ? (
          <LazyBenchForm caseId={file.id} instruments={bench.instruments} analystName={actor.name} sampleCode={bench.sample?.code ?? null} rules={{ precision: rules.precision, calibration: { nominal: rules.calibration.nominal, readings: rules.calibration.readings, tolerance: rules.calibration.tolerance, required: rules.calibration.required }, hortvetConversion: rules.display.hortvetConversion }} />
        ) : null}
        {bench.proposal && (bench.hasRetest || bench.showProposal) ? <ReviewPanel assessment={bench.proposal.assessment} input={bench.proposal.input} showProposal={bench.showProposal} /> : null}
        {bench.allowed.includes('order_further_test') ? <FurtherTestForm caseId={file.id} laboratories={bench.laboratories} suggestedCode={`F-${file.number}-${file.samples.length + 1}`} /> : null}
        {corrected && panel.decisions.length > 1 ? <FormMessage tone="success">The correction is signed and sealed; it supersedes the earlier decision, which stays in the record. The parties have been sent the new letter.</FormMessage> : null}
        {panel.form && !panel.form.correcting ? <DecisionForm caseId={file.id} data={panel.form} /> : null}
        <ContestedResult file={file} />
        <Readings file={file} />
        <SamplesAndCustody file={file} />
        <Evidence file={file} actor={actor} />
        <Notes file={file} actor={actor} />
        <DecisionSection file={file} sealed={
            panel.decisions.length ? (
              <>
                <SealedDecisions decisions={panel.decisions} />
                {panel.form?.correcting ? (
                  <details className="mt-4" data-testid="correct-decision">
                    <summary className="cursor-pointer font-bold">Correct this decision</summary>
                    <div className="mt-3">
                      <DecisionForm caseId={file.id} data={panel.form} />
                    </div>
                  </details>
                ) : null}
              </>
            ) : undefined
          } />
        <Ledger file={file} />
        {bench.allowed.includes('withdraw') ? <WithdrawForm caseId={file.id} status={file.status} /> : null}
      </div>
    </>
  );
}
