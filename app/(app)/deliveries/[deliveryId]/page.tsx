import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { getDeliveryRecord } from '@/lib/dal/intake-record';
import { isAppError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format/dates';
import { formatStorageCelsius, formatCelsius } from '@/lib/temperature';
import { Card, DefinitionList, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';
import { CorrectionHistory, IntakeResultDetails } from '@/components/intake/intake-record';
import { CorrectionForm } from '@/components/intake/correction-form';
import type { Actor } from '@/lib/auth/actor';

export const metadata: Metadata = { title: 'Delivery' };

async function load(actor: Actor, id: string) {
  try {
    return await getDeliveryRecord(getDb(), actor, id);
  } catch (error) {
    if (isAppError(error) && error.code === 'not_found') notFound();
    throw error;
  }
}

const custodyLabels: Record<string, string> = { sealed: 'Sealed', stored: 'Stored', dispatched: 'Dispatched', received: 'Received', seal_checked: 'Seal checked', opened: 'Opened', disposed: 'Disposed' };

export default async function DeliveryPage({ params, searchParams }: { params: Promise<{ deliveryId: string }>; searchParams: Promise<{ done?: string }> }) {
  const actor = await requirePermission('delivery', 'read');
  const [{ deliveryId }, { done }] = await Promise.all([params, searchParams]);
  const record = await load(actor, deliveryId);
  const current = record.current;
  const told = current?.notifiedAt ? `The supplier was told on ${formatDateTime(current.notifiedAt)}${current.contestDeadline ? `; it may contest until ${formatDateTime(current.contestDeadline)}` : ''}.` : '';

  return (
    <>
      <PageHeader title={`Delivery ${record.reference}`} eyebrow={`${record.farmName} (${record.herdCode}) · ${record.supplierName}`}>
        {actor.role === 'supplier' && current?.contestOpen ? <ButtonLink href={`/deliveries/${record.id}/dispute`}>Open a dispute</ButtonLink> : null}
      </PageHeader>
      <div className="grid gap-6">
        {done === 'recorded' ? <FormMessage tone="success">Intake recorded{current ? ` as ${current.verdict}` : ''}. {told}</FormMessage> : null}
        {done === 'corrected' ? <FormMessage tone="success">Correction recorded; the earlier result is kept below. {told}</FormMessage> : null}
        <Card id="result" title="Intake result">
          {current ? <IntakeResultDetails result={current} showInstrumentLink={actor.role === 'plant'} /> : <EmptyState title="No intake result is recorded for this delivery." />}
          {current && current.supersedesId ? (
            <p className="mt-3 text-sm text-brine">
              This result corrects an earlier one ({formatDateTime(current.decidedAt)}, by {current.decidedByName ?? 'the plant'}): “{current.correctionReason}”
            </p>
          ) : null}
        </Card>
        <div className="grid gap-6 md:grid-cols-2">
          <Card id="load" title="The load">
            <DefinitionList
              items={[
                { term: 'Collected', detail: formatDateTime(record.collectedAt) },
                { term: 'Received', detail: formatDateTime(record.receivedAt) },
                { term: 'Volume', detail: <span className="num">{record.volumeLitres.toLocaleString('en-GB')} l</span> },
                { term: 'Tanker', detail: `${record.tanker}, compartment ${record.compartment}` },
                { term: 'On receipt', detail: <span className="num">{formatStorageCelsius(record.receiptTempTenthMilliC)}</span> },
              ]}
            />
          </Card>
          <Card id="samples" title="Samples and custody">
            <ul className="grid gap-3 text-sm">
              {record.samples.map((s) => (
                <li key={s.id}>
                  <p className="font-bold">
                    {s.kind === 'retained' ? 'Retained' : 'Routine'} sample <span className="num">{s.code}</span>
                    {s.sealNumber ? <span className="font-normal"> · seal {s.sealNumber}</span> : null}
                  </p>
                  {s.storage ? <p className="text-brine">{s.storage}</p> : null}
                  {s.custody.length ? (
                    <ol className="mt-1 border-l-2 border-line pl-3">
                      {s.custody.map((event) => (
                        <li key={event.id}>
                          <span className="font-bold">{custodyLabels[event.kind] ?? event.kind}</span> {formatDateTime(event.at)}
                          {event.location ? ` · ${event.location}` : ''}
                          {event.tempTenthMilliC !== null ? ` · ${formatStorageCelsius(event.tempTenthMilliC)}` : ''}
                          {event.sealIntact === true ? ' · seal intact' : event.sealIntact === false ? ' · seal broken' : ''}
                        </li>
                      ))}
                    </ol>
                  ) : null}
                </li>
              ))}
            </ul>
          </Card>
        </div>
        {actor.role === 'plant' && current ? (
          <Card id="correct" title="Correct this result">
            {record.mayCorrect ? (
              <details>
                <summary className="cursor-pointer text-sm font-bold text-frost-dark">Correct the readings of this result…</summary>
                <p className="my-3 text-sm text-ink-soft">
                  A correction is possible until the supplier disputes the result. The current result stays on record, marked as superseded, with your name, the time and your reason; the supplier is told
                  of the corrected result. It is judged under the same rules version (v{current.rulesVersion}).
                </p>
                <CorrectionForm
                  intakeResultId={current.id}
                  precision={current.rules.precision}
                  current={{
                    readings: current.readings.map((r) => ({ value: formatCelsius(r.valueTenthMilliC, 4).replace(' °C', '').replace('\u2212', '-'), flag: r.flag })),
                    sampleTemperature: current.sampleTempTenthMilliC === null ? '' : (current.sampleTempTenthMilliC / 10_000).toFixed(1),
                    preparation: current.preparation,
                  }}
                />
              </details>
            ) : (
              <p className="text-sm text-brine">
                {record.correctionBlockedBy
                  ? `This delivery is disputed in ${record.correctionBlockedBy}; its result can no longer be corrected here. Tell the board in the case file.`
                  : 'Your role cannot correct intake results.'}
              </p>
            )}
          </Card>
        ) : null}
        <CorrectionHistory record={record} />
      </div>
    </>
  );
}
