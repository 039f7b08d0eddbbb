import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { CHECK_HISTORY, getInstrument } from '@/lib/dal/instruments';
import { rulesInForce } from '@/lib/dal/rules';
import { isAppError } from '@/lib/errors';
import { sodiumChlorideFor } from '@/lib/arbitration';
import { Card, DefinitionList, EmptyState, PageHeader } from '@/components/ui/card';
import { FormMessage } from '@/components/ui/field';
import { Badge } from '@/components/ui/status';
import { InstrumentStatusBadge } from '@/components/instruments/instrument-status';
import { CalibrationCheckForm } from '@/components/instruments/calibration-check-form';
import { formatCelsius, formatMilliC, fromTenthMilliC } from '@/lib/temperature';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Instrument' };

async function load(actor: Parameters<typeof getInstrument>[1], id: string) {
  try {
    return await getInstrument(getDb(), actor, id);
  } catch (error) {
    if (isAppError(error) && error.code === 'not_found') notFound();
    throw error;
  }
}

export default async function InstrumentPage({ params, searchParams }: { params: Promise<{ instrumentId: string }>; searchParams: Promise<{ done?: string }> }) {
  const actor = await requirePermission('instrument', 'read');
  const [{ instrumentId }, { done }] = await Promise.all([params, searchParams]);
  const device = await load(actor, instrumentId);
  const rules = device.mayCheck ? await rulesInForce(getDb()) : null;
  const latest = device.checks[0];
  return (
    <>
      <PageHeader title={`Instrument ${device.serialNumber}`} eyebrow={device.organisationName}>
        <InstrumentStatusBadge status={device.status} />
      </PageHeader>
      <div className="grid gap-6">
        {done === 'passed' && latest ? <FormMessage tone="success">Check recorded: {latest.within} of {latest.readingsTenthMilliC.length} readings within tolerance. The instrument is fit for work until {formatDateTime(latest.validUntil)}.</FormMessage> : null}
        {done === 'failed' && latest ? <FormMessage tone="error">Check recorded as failed: {latest.within} of {latest.readingsTenthMilliC.length} within tolerance, {latest.required} needed. Recalibrate the instrument and check again before any intake test.</FormMessage> : null}
        <Card title="The instrument">
          <DefinitionList
            items={[
              { term: 'Description', detail: device.description },
              { term: 'Method', detail: device.method },
              { term: 'Status', detail: <InstrumentStatusBadge status={device.status} /> },
            ]}
          />
        </Card>
        {device.mayCheck ? (
          <Card id="check" title="Record a calibration check">
            {rules ? (
              <CalibrationCheckForm key={latest?.id ?? 'none'} instrumentId={device.id} rule={rules.rules.calibration} rulesVersion={rules.version} analystName={actor.name} />
            ) : (
              <EmptyState title="No scheme rules are in force">The check’s tolerance and count come from the scheme’s rules.</EmptyState>
            )}
          </Card>
        ) : null}
        <Card title={`Latest checks (up to ${CHECK_HISTORY})`}>
          {device.checks.length === 0 ? (
            <EmptyState title="No check recorded yet." />
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-sm">
                <thead>
                  <tr className="border-b border-line text-left text-brine">
                    <th scope="col" className="py-2 pr-3">Checked</th>
                    <th scope="col" className="py-2 pr-3">Standard</th>
                    <th scope="col" className="py-2 pr-3">Readings</th>
                    <th scope="col" className="py-2 pr-3">Verdict</th>
                    <th scope="col" className="py-2 pr-3">Valid until</th>
                    <th scope="col" className="py-2">By</th>
                  </tr>
                </thead>
                <tbody>
                  {device.checks.map((check) => (
                    <tr key={check.id} className="border-b border-line/60 align-top">
                      <td className="py-2 pr-3 num">{formatDateTime(check.checkedAt)}</td>
                      <td className="py-2 pr-3 num">
                        {formatCelsius(check.nominalTenthMilliC)}
                        <span className="block text-xs text-brine">{saltText(check.nominalTenthMilliC)}</span>
                      </td>
                      <td className="py-2 pr-3 num">{check.readingsTenthMilliC.map((r) => formatCelsius(r, 4).replace(' °C', '')).join(', ')}</td>
                      <td className="py-2 pr-3">
                        {check.pass ? <Badge tone="success">Passed</Badge> : <Badge tone="failure">Failed</Badge>}
                        <span className="block text-xs text-brine">
                          {check.within} of {check.readingsTenthMilliC.length} within ±{formatMilliC(check.toleranceTenthMilliC)}, {check.required} needed{check.rulesVersion ? ` · rules v${check.rulesVersion}` : ''}
                        </span>
                      </td>
                      <td className="py-2 pr-3 num">{formatDateTime(check.validUntil)}</td>
                      <td className="py-2">{check.analystName}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
      </div>
    </>
  );
}

function saltText(nominalTenthMilliC: number): string {
  try {
    return `${sodiumChlorideFor(fromTenthMilliC(nominalTenthMilliC)).toFixed(3)} g NaCl/kg water`;
  } catch {
    return '';
  }
}
